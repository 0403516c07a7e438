//! Working fluids of Rankine engines and vapour-compression chillers: eight from the
//! Peng–Robinson equation of state (`cubic.rs`) with each fluid's published constants, and
//! water/steam ([`Fluid::Water`]) from IAPWS-IF97 (`steam.rs`, through `seuif97`). Every public
//! function here takes the fluid and dispatches water to `steam.rs`, so the engine and the
//! route see one API; the Peng–Robinson notes below do not apply to water (see `steam.rs`).
//!
//! Enthalpy and entropy follow the IIR convention for every fluid: h = 200 kJ/kg and
//! s = 1 kJ/(kg·K) for saturated liquid at 0 °C.
//!
//! The saturation line is solved once per fluid (on first use, `std::sync::OnceLock`) on a
//! uniform grid of [`TABLE_POINTS`] temperatures from [`Fluid::t_min_c`] to Tc − 0.5 K, and
//! interpolated linearly (ln p, h, s, 1/ρ against T; T against ln p through 1/T). Measured
//! interpolation error against the direct fugacity solve (unit test
//! `table_matches_direct_solve`): below 1e-4 relative in pressure, 0.02 kJ/kg in enthalpy and
//! 0.01 K in temperature below 0.98 Tc; it grows near the critical point, where cycles of this
//! tool do not go.
//!
//! Accuracy against a reference multiparameter equation of state (CoolProp 6.6.0, measured in
//! `reference/fluid_coolprop_deviation.csv`): see that table; in short, saturation pressure to a
//! few per cent, latent heat to a few per cent, enough to screen cycles, not to design them.

use super::cubic::{Phase, PrFluid, PrPoint};
use super::steam;
use crate::error::{Error, Result};
use std::sync::OnceLock;

/// Points of each fluid's saturation table.
pub const TABLE_POINTS: usize = 401;
/// Highest pressure accepted for single-phase states, as a multiple of the critical pressure.
const P_MAX_OVER_PC: f64 = 3.0;
/// IIR reference: saturated liquid at 0 °C has h = 200 kJ/kg, s = 1 kJ/(kg·K).
const T_IIR_K: f64 = 273.15;
const H_IIR_KJ_KG: f64 = 200.0;
const S_IIR_KJ_KGK: f64 = 1.0;
const K0: f64 = 273.15;

/// A working fluid.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Fluid {
    R245fa,
    NPentane,
    R1233zdE,
    Toluene,
    R134a,
    R32,
    R290,
    R1234zeE,
    /// Water and steam (R718), IAPWS-IF97 (`steam.rs`); an engine fluid.
    Water,
}

/// Constants of one fluid: critical point, acentric factor, molar mass, triple point, and the
/// upper temperature of the ideal-gas heat capacity fit.
struct Constants {
    name: &'static str,
    aliases: &'static [&'static str],
    pr: PrFluid,
    t_triple_k: f64,
    t_max_k: f64,
}

// Source of every constant below: CoolProp 6.6.0 (PyPI) fluid files, as returned by
// PropsSI('Tcrit' | 'pcrit' | 'acentric' | 'molar_mass' | 'Ttriple', fluid), printed by
// reference/scripts/make_fluid_coolprop.py into reference/fluid_constants_coolprop.txt.
// cp0_r: cp°/R = Σ c_k (T/100 K)^k, a quartic least-squares fit (same script) to CoolProp 6.6.0
// CP0MOLAR (the ideal-gas part of each fluid's Helmholtz equation) over [t_fit_lo, t_max] K;
// largest relative fit error in the comment.
const CONSTANTS: [Constants; 8] = [
    // R245fa: fit 200–600 K, max rel. error 1.2e-3
    Constants {
        name: "R245fa",
        aliases: &["r245fa", "245fa"],
        pr: PrFluid {
            tc_k: 427.01,
            pc_pa: 3_651_000.0,
            omega: 0.3776,
            m_kg_mol: 0.134_047_94,
            cp0_r: [
                2.960_096_047_147_927,
                4.530_552_539_818_989,
                -0.379_448_679_564_177_8,
                0.035_235_091_169_176_95,
                -0.002_072_173_958_300_918,
            ],
        },
        t_triple_k: 171.05,
        t_max_k: 600.0,
    },
    // n-pentane: fit 200–650 K, max rel. error 2.7e-3
    Constants {
        name: "n-pentane",
        aliases: &["npentane", "pentane", "n-pentane", "r601"],
        pr: PrFluid {
            tc_k: 469.7,
            pc_pa: 3_367_518.994_736_339_4,
            omega: 0.251_031_912_680_428_1,
            m_kg_mol: 0.072_148_78,
            cp0_r: [
                11.022_525_907_856_368,
                -3.685_312_677_038_558_7,
                2.540_365_625_936_136,
                -0.360_091_757_231_469_9,
                0.017_393_679_745_262_434,
            ],
        },
        t_triple_k: 143.47,
        t_max_k: 650.0,
    },
    // R1233zd(E): fit 200–600 K, max rel. error 2.3e-3
    Constants {
        name: "R1233zd(E)",
        aliases: &["r1233zd(e)", "r1233zde", "r1233zd", "1233zd(e)"],
        pr: PrFluid {
            tc_k: 439.6,
            pc_pa: 3_623_637.776_364_795_4,
            omega: 0.302_452_293_580_176_8,
            m_kg_mol: 0.130_494_4,
            cp0_r: [
                -4.260_955_783_169_671,
                11.173_041_150_310_222,
                -2.847_049_375_982_996,
                0.394_674_347_159_714_7,
                -0.021_388_876_735_889_573,
            ],
        },
        t_triple_k: 195.15,
        t_max_k: 600.0,
    },
    // toluene: fit 250–750 K, max rel. error 2.6e-3
    Constants {
        name: "toluene",
        aliases: &["toluene", "methylbenzene"],
        pr: PrFluid {
            tc_k: 591.75,
            pc_pa: 4_126_000.0,
            omega: 0.2657,
            m_kg_mol: 0.092_138_42,
            cp0_r: [
                1.311_690_005_688_406_9,
                2.049_130_233_277_680_6,
                1.005_852_365_999_289,
                -0.170_250_580_316_231_75,
                0.008_158_440_122_944_541,
            ],
        },
        t_triple_k: 178.0,
        t_max_k: 750.0,
    },
    // R134a: fit 180–500 K, max rel. error 1.5e-4
    Constants {
        name: "R134a",
        aliases: &["r134a", "134a"],
        pr: PrFluid {
            tc_k: 374.21,
            pc_pa: 4_059_280.0,
            omega: 0.32684,
            m_kg_mol: 0.102_032,
            cp0_r: [
                1.594_796_005_436_534_7,
                3.989_748_296_292_390_7,
                -0.525_349_423_252_411_3,
                0.063_043_615_093_515_26,
                -0.003_334_828_530_643_496_3,
            ],
        },
        t_triple_k: 169.85,
        t_max_k: 500.0,
    },
    // R32: fit 180–500 K, max rel. error 1.2e-3
    Constants {
        name: "R32",
        aliases: &["r32", "difluoromethane"],
        pr: PrFluid {
            tc_k: 351.255,
            pc_pa: 5_782_000.0,
            omega: 0.2769,
            m_kg_mol: 0.052_024,
            cp0_r: [
                4.782_411_877_848_578,
                -1.178_663_625_113_573_8,
                0.629_861_183_357_385_7,
                -0.070_432_843_770_922_78,
                0.002_098_603_160_442_242,
            ],
        },
        t_triple_k: 136.34,
        t_max_k: 500.0,
    },
    // R290 (propane): fit 180–500 K, max rel. error 1.5e-3
    Constants {
        name: "R290",
        aliases: &["r290", "propane"],
        pr: PrFluid {
            tc_k: 369.89,
            pc_pa: 4_251_200.0,
            omega: 0.1521,
            m_kg_mol: 0.044_095_62,
            cp0_r: [
                5.978_274_678_659_309,
                -1.677_602_509_748_450_2,
                1.375_227_610_606_876_8,
                -0.190_838_753_557_026_18,
                0.008_593_769_759_170_24,
            ],
        },
        t_triple_k: 85.525,
        t_max_k: 500.0,
    },
    // R1234ze(E): fit 180–500 K, max rel. error 2.2e-3
    Constants {
        name: "R1234ze(E)",
        aliases: &["r1234ze(e)", "r1234zee", "r1234ze", "1234ze(e)"],
        pr: PrFluid {
            tc_k: 382.52,
            pc_pa: 3_634_936.851_021_726,
            omega: 0.313_144_006_762_486_2,
            m_kg_mol: 0.114_041_592_8,
            cp0_r: [
                -1.805_574_992_572_116_7,
                10.201_818_139_132_49,
                -3.253_827_738_351_765,
                0.582_158_760_639_170_3,
                -0.039_532_476_876_813_28,
            ],
        },
        t_triple_k: 168.62,
        t_max_k: 500.0,
    },
];

impl Fluid {
    /// The fluids modelled by the Peng–Robinson equation (all but water).
    pub const PENG_ROBINSON: [Fluid; 8] = [
        Fluid::R245fa,
        Fluid::NPentane,
        Fluid::R1233zdE,
        Fluid::Toluene,
        Fluid::R134a,
        Fluid::R32,
        Fluid::R290,
        Fluid::R1234zeE,
    ];

    /// Every fluid: the Peng–Robinson ones (engine fluids first), then water.
    pub const ALL: [Fluid; 9] = {
        let mut all = [Fluid::Water; 9];
        let mut i = 0;
        while i < Fluid::PENG_ROBINSON.len() {
            all[i] = Fluid::PENG_ROBINSON[i];
            i += 1;
        }
        all
    };

    fn idx(self) -> usize {
        self as usize
    }

    /// The Peng–Robinson constants; `None` for water.
    fn c(self) -> Option<&'static Constants> {
        match self {
            Fluid::Water => None,
            f => Some(&CONSTANTS[f.idx()]),
        }
    }

    fn aliases(self) -> &'static [&'static str] {
        match self.c() {
            Some(c) => c.aliases,
            None => &["water", "steam", "r718", "h2o"],
        }
    }

    /// The fluid named `name` (case-insensitive; `R245fa`, `n-pentane`, `R1233zd(E)`,
    /// `toluene`, `R134a`, `R32`, `R290`, `R1234ze(E)`, `water` and common aliases such as
    /// `propane` or `steam`). Error `Input` on key `fluid` listing the known names.
    pub fn from_name(name: &str) -> Result<Fluid> {
        let n = name.trim().to_ascii_lowercase();
        for f in Fluid::ALL {
            if f.name().to_ascii_lowercase() == n || f.aliases().contains(&n.as_str()) {
                return Ok(f);
            }
        }
        let known: Vec<&str> = Fluid::ALL.iter().map(|f| f.name()).collect();
        Err(Error::input(
            "fluid",
            format!("\"{name}\""),
            format!("unknown working fluid; known: {}", known.join(", ")),
        ))
    }

    /// Display name (`R245fa`, `n-pentane`, `R1233zd(E)`, `toluene`, `R134a`, `R32`, `R290`,
    /// `R1234ze(E)`, `water`).
    pub fn name(self) -> &'static str {
        self.c().map_or("water", |c| c.name)
    }

    /// Property model, for titles: `Peng–Robinson` or `IAPWS-IF97`.
    pub fn model(self) -> &'static str {
        if self.c().is_some() {
            "Peng–Robinson"
        } else {
            "IAPWS-IF97"
        }
    }

    /// Critical temperature, °C.
    pub fn t_crit_c(self) -> f64 {
        self.c().map_or(steam::T_CRIT_C, |c| c.pr.tc_k - K0)
    }

    /// Critical pressure, kPa.
    pub fn p_crit_kpa(self) -> f64 {
        self.c().map_or(steam::P_CRIT_KPA, |c| c.pr.pc_pa / 1000.0)
    }

    /// Molar mass, kg/mol.
    pub fn molar_mass_kg_mol(self) -> f64 {
        self.c().map_or(steam::M_KG_MOL, |c| c.pr.m_kg_mol)
    }

    /// Lowest temperature of the model, °C: for Peng–Robinson fluids the largest of the triple
    /// point + 0.5 K, 0.45 Tc and 200 K (where the cubic's liquid root is still well
    /// conditioned); for water 0 °C (IF97's lower bound).
    pub fn t_min_c(self) -> f64 {
        self.c().map_or(steam::T_MIN_C, |c| t_lo_k(c) - K0)
    }

    /// Highest saturation temperature, °C: Tc − 0.5 K (Peng–Robinson table); 350 °C for water
    /// (IF97 region 3 not used).
    pub fn t_sat_max_c(self) -> f64 {
        self.c()
            .map_or(steam::T_SAT_MAX_C, |c| c.pr.tc_k - 0.5 - K0)
    }

    /// Highest temperature of the model, °C (upper end of the ideal-gas cp fit; 800 °C, the
    /// top of IF97 region 2, for water).
    pub fn t_max_c(self) -> f64 {
        self.c().map_or(steam::T_MAX_C, |c| c.t_max_k - K0)
    }
}

fn t_lo_k(c: &Constants) -> f64 {
    (c.t_triple_k + 0.5).max(0.45 * c.pr.tc_k).max(200.0)
}

/// A thermodynamic state.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FluidState {
    pub fluid: Fluid,
    /// Temperature, °C.
    pub t_c: f64,
    /// Pressure, kPa.
    pub p_kpa: f64,
    /// Vapour quality (mass fraction of vapour) in the two-phase region, `None` outside it.
    pub q: Option<f64>,
    /// Specific enthalpy, kJ/kg (IIR reference).
    pub h_kj_kg: f64,
    /// Specific entropy, kJ/(kg·K) (IIR reference).
    pub s_kj_kg_k: f64,
    /// Density, kg/m³.
    pub rho_kg_m3: f64,
}

/// Both saturated states at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Saturation {
    pub t_c: f64,
    pub p_kpa: f64,
    pub h_liq_kj_kg: f64,
    pub h_vap_kj_kg: f64,
    pub s_liq_kj_kgk: f64,
    pub s_vap_kj_kgk: f64,
    /// Specific volumes, m³/kg.
    pub v_liq_m3_kg: f64,
    pub v_vap_m3_kg: f64,
}

impl Saturation {
    /// Latent heat of vaporisation, kJ/kg.
    pub fn h_fg_kj_kg(&self) -> f64 {
        self.h_vap_kj_kg - self.h_liq_kj_kg
    }
}

/// Table row: ln p (Pa), h_l, h_v, s_l, s_v, v_l, v_v (per kg).
type Row = [f64; 7];

struct Data {
    pr: PrFluid,
    /// kJ/kg added to `h_raw / M / 1000`.
    dh: f64,
    /// kJ/(kg·K) added to `s_raw / M / 1000`.
    ds: f64,
    t0_k: f64,
    dt_k: f64,
    t_max_k: f64,
    rows: Vec<Row>,
}

static DATA: [OnceLock<std::result::Result<Data, String>>; 8] = [const { OnceLock::new() }; 8];

impl Data {
    fn h_kj_kg(&self, t_k: f64, pt: &PrPoint) -> f64 {
        self.pr.h_j_mol(t_k, pt) / self.pr.m_kg_mol / 1000.0 + self.dh
    }
    fn s_kj_kgk(&self, t_k: f64, p_pa: f64, pt: &PrPoint) -> f64 {
        self.pr.s_j_molk(t_k, p_pa, pt) / self.pr.m_kg_mol / 1000.0 + self.ds
    }
    fn v_m3_kg(&self, pt: &PrPoint) -> f64 {
        pt.v_m3_mol / self.pr.m_kg_mol
    }
    fn t_hi_k(&self) -> f64 {
        self.t0_k + self.dt_k * (TABLE_POINTS - 1) as f64
    }
    fn ln_p_lo(&self) -> f64 {
        self.rows[0][0]
    }
    fn ln_p_hi(&self) -> f64 {
        self.rows[TABLE_POINTS - 1][0]
    }

    fn build(c: &Constants) -> Result<Data> {
        let pr = c.pr;
        let mut d = Data {
            pr,
            dh: 0.0,
            ds: 0.0,
            t0_k: t_lo_k(c),
            dt_k: (pr.tc_k - 0.5 - t_lo_k(c)) / (TABLE_POINTS - 1) as f64,
            t_max_k: c.t_max_k,
            rows: Vec::with_capacity(TABLE_POINTS),
        };
        let (p0, l0, _) = pr.saturation(T_IIR_K)?;
        d.dh = H_IIR_KJ_KG - d.h_kj_kg(T_IIR_K, &l0);
        d.ds = S_IIR_KJ_KGK - d.s_kj_kgk(T_IIR_K, p0, &l0);
        for i in 0..TABLE_POINTS {
            let t = d.t0_k + d.dt_k * i as f64;
            let (p, l, v) = pr.saturation(t)?;
            let row = [
                p.ln(),
                d.h_kj_kg(t, &l),
                d.h_kj_kg(t, &v),
                d.s_kj_kgk(t, p, &l),
                d.s_kj_kgk(t, p, &v),
                d.v_m3_kg(&l),
                d.v_m3_kg(&v),
            ];
            d.rows.push(row);
        }
        Ok(d)
    }

    /// Interpolated row at `t_k` (within the table).
    fn at_t(&self, t_k: f64) -> Row {
        let x = ((t_k - self.t0_k) / self.dt_k).clamp(0.0, (TABLE_POINTS - 1) as f64);
        let i = (x.floor() as usize).min(TABLE_POINTS - 2);
        let w = x - i as f64;
        let (a, b) = (&self.rows[i], &self.rows[i + 1]);
        let mut out = [0.0; 7];
        for k in 0..7 {
            out[k] = a[k] + w * (b[k] - a[k]);
        }
        out
    }

    /// Saturation temperature, K, at `ln p` within the table: bisection for the interval, then
    /// 1/T linear in ln p inside it (Clausius–Clapeyron form).
    fn t_at_ln_p(&self, ln_p: f64) -> f64 {
        let (mut lo, mut hi) = (0usize, TABLE_POINTS - 1);
        while hi - lo > 1 {
            let mid = (lo + hi) / 2;
            if self.rows[mid][0] <= ln_p {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let (ta, tb) = (
            self.t0_k + self.dt_k * lo as f64,
            self.t0_k + self.dt_k * hi as f64,
        );
        let (la, lb) = (self.rows[lo][0], self.rows[hi][0]);
        let w = (ln_p - la) / (lb - la);
        1.0 / (1.0 / ta + w * (1.0 / tb - 1.0 / ta))
    }

    /// Phase to take at (T, p): liquid above the saturation pressure, vapour below; the stable
    /// root beyond the table's top.
    fn phase_at(&self, t_k: f64, p_pa: f64) -> Phase {
        if t_k > self.t_hi_k() {
            Phase::Stable
        } else if p_pa.ln() > self.at_t(t_k)[0] {
            Phase::Liquid
        } else {
            Phase::Vapour
        }
    }

    /// (h, s, v) per kg at (T, p) in the phase given.
    fn single(&self, t_k: f64, p_pa: f64, phase: Phase) -> Result<(f64, f64, f64)> {
        let pt = self.pr.phase_point(t_k, p_pa, phase)?;
        Ok((
            self.h_kj_kg(t_k, &pt),
            self.s_kj_kgk(t_k, p_pa, &pt),
            self.v_m3_kg(&pt),
        ))
    }
}

fn data(f: Fluid) -> Result<&'static Data> {
    let (Some(c), Some(cell)) = (f.c(), DATA.get(f.idx())) else {
        return Err(Error::Internal(format!(
            "{}: not a Peng-Robinson fluid",
            f.name()
        )));
    };
    cell.get_or_init(|| Data::build(c).map_err(|e| e.to_string()))
        .as_ref()
        .map_err(|e| Error::Internal(format!("{}: saturation table: {e}", f.name())))
}

fn out_of_range(quantity: &'static str, value: f64, range: String) -> Error {
    Error::OutOfRange {
        model: "Peng-Robinson fluid",
        quantity,
        value,
        range,
    }
}

fn check_t_sat(f: Fluid, t_c: f64) -> Result<()> {
    if t_c.is_finite() && t_c >= f.t_min_c() - 1e-9 && t_c <= f.t_sat_max_c() + 1e-9 {
        Ok(())
    } else {
        Err(out_of_range(
            "saturation temperature, °C",
            t_c,
            format!(
                "{:.2}..{:.2} °C for {} (saturation line of the model)",
                f.t_min_c(),
                f.t_sat_max_c(),
                f.name()
            ),
        ))
    }
}

fn check_p_sat(f: Fluid, d: &Data, p_kpa: f64) -> Result<()> {
    let (lo, hi) = (d.ln_p_lo().exp() / 1000.0, d.ln_p_hi().exp() / 1000.0);
    if p_kpa.is_finite() && p_kpa >= lo * (1.0 - 1e-12) && p_kpa <= hi * (1.0 + 1e-12) {
        Ok(())
    } else {
        Err(out_of_range(
            "saturation pressure, kPa",
            p_kpa,
            format!(
                "{lo:.4}..{hi:.1} kPa for {} (saturation line of the model)",
                f.name()
            ),
        ))
    }
}

fn sat_from_row(t_k: f64, r: &Row) -> Saturation {
    Saturation {
        t_c: t_k - K0,
        p_kpa: r[0].exp() / 1000.0,
        h_liq_kj_kg: r[1],
        h_vap_kj_kg: r[2],
        s_liq_kj_kgk: r[3],
        s_vap_kj_kgk: r[4],
        v_liq_m3_kg: r[5],
        v_vap_m3_kg: r[6],
    }
}

/// Both saturated states at `t_c`, interpolated in the fluid's saturation table.
///
/// * `t_c` – saturation temperature, °C, from [`Fluid::t_min_c`] to [`Fluid::t_sat_max_c`]
///
/// Error `OutOfRange` outside. Source: Peng–Robinson (1976) by equal fugacities (`cubic.rs`),
/// tabulated (module docs give the interpolation error).
pub fn saturation(f: Fluid, t_c: f64) -> Result<Saturation> {
    if f == Fluid::Water {
        return steam::saturation(t_c);
    }
    check_t_sat(f, t_c)?;
    let d = data(f)?;
    let t_k = t_c + K0;
    Ok(sat_from_row(t_k, &d.at_t(t_k)))
}

/// Both saturated states at `t_c` solved directly by equal fugacities (no table): slower, used
/// to measure the table's error. Same range and errors as [`saturation`]. Water has no table:
/// the same as [`saturation`].
pub fn saturation_direct(f: Fluid, t_c: f64) -> Result<Saturation> {
    if f == Fluid::Water {
        return steam::saturation(t_c);
    }
    check_t_sat(f, t_c)?;
    let d = data(f)?;
    let t_k = t_c + K0;
    let (p, l, v) = d.pr.saturation(t_k)?;
    Ok(Saturation {
        t_c,
        p_kpa: p / 1000.0,
        h_liq_kj_kg: d.h_kj_kg(t_k, &l),
        h_vap_kj_kg: d.h_kj_kg(t_k, &v),
        s_liq_kj_kgk: d.s_kj_kgk(t_k, p, &l),
        s_vap_kj_kgk: d.s_kj_kgk(t_k, p, &v),
        v_liq_m3_kg: d.v_m3_kg(&l),
        v_vap_m3_kg: d.v_m3_kg(&v),
    })
}

/// Saturation pressure, kPa, at `t_c` °C (tabulated Peng–Robinson; range as [`saturation`]).
pub fn sat_pressure_kpa(f: Fluid, t_c: f64) -> Result<f64> {
    Ok(saturation(f, t_c)?.p_kpa)
}

/// Saturation temperature, °C, at `p_kpa` kPa (inverse of the tabulated saturation line;
/// 1/T interpolated linearly in ln p).
///
/// * `p_kpa` – between the saturation pressures at [`Fluid::t_min_c`] and [`Fluid::t_sat_max_c`]
///
/// Error `OutOfRange` outside.
pub fn sat_temperature_c(f: Fluid, p_kpa: f64) -> Result<f64> {
    if f == Fluid::Water {
        return steam::sat_temperature_c(p_kpa);
    }
    let d = data(f)?;
    check_p_sat(f, d, p_kpa)?;
    Ok(d.t_at_ln_p((p_kpa * 1000.0).ln()) - K0)
}

fn two_phase(f: Fluid, s: &Saturation, q: f64) -> FluidState {
    let v = s.v_liq_m3_kg + q * (s.v_vap_m3_kg - s.v_liq_m3_kg);
    FluidState {
        fluid: f,
        t_c: s.t_c,
        p_kpa: s.p_kpa,
        q: Some(q),
        h_kj_kg: s.h_liq_kj_kg + q * s.h_fg_kj_kg(),
        s_kj_kg_k: s.s_liq_kj_kgk + q * (s.s_vap_kj_kgk - s.s_liq_kj_kgk),
        rho_kg_m3: 1.0 / v,
    }
}

fn check_q(q: f64) -> Result<()> {
    if q.is_finite() && (0.0..=1.0).contains(&q) {
        Ok(())
    } else {
        Err(out_of_range("vapour quality", q, "0..1".into()))
    }
}

/// Saturated or two-phase state at temperature `t_c` °C and quality `q` (0 liquid, 1 vapour):
/// `x = x_l + q (x_v − x_l)` for h, s and specific volume. Range as [`saturation`].
pub fn state_tq(f: Fluid, t_c: f64, q: f64) -> Result<FluidState> {
    check_q(q)?;
    Ok(two_phase(f, &saturation(f, t_c)?, q))
}

/// Saturated or two-phase state at pressure `p_kpa` kPa and quality `q`. Range as
/// [`sat_temperature_c`].
pub fn state_pq(f: Fluid, p_kpa: f64, q: f64) -> Result<FluidState> {
    check_q(q)?;
    let t_c = sat_temperature_c(f, p_kpa)?;
    let mut s = saturation(f, t_c)?;
    s.p_kpa = p_kpa;
    Ok(two_phase(f, &s, q))
}

fn check_p(f: Fluid, p_kpa: f64) -> Result<()> {
    let hi = P_MAX_OVER_PC * f.p_crit_kpa();
    if p_kpa.is_finite() && p_kpa > 1e-3 && p_kpa <= hi {
        Ok(())
    } else {
        Err(out_of_range(
            "pressure, kPa",
            p_kpa,
            format!(
                "0.001..{hi:.0} kPa for {} (3 × critical pressure)",
                f.name()
            ),
        ))
    }
}

fn check_t(f: Fluid, t_c: f64) -> Result<()> {
    if t_c.is_finite() && t_c >= f.t_min_c() - 1e-9 && t_c <= f.t_max_c() + 1e-9 {
        Ok(())
    } else {
        Err(out_of_range(
            "temperature, °C",
            t_c,
            format!(
                "{:.2}..{:.2} °C for {} (range of the model)",
                f.t_min_c(),
                f.t_max_c(),
                f.name()
            ),
        ))
    }
}

fn single_state(f: Fluid, d: &Data, t_k: f64, p_pa: f64, phase: Phase) -> Result<FluidState> {
    let (h, s, v) = d.single(t_k, p_pa, phase)?;
    Ok(FluidState {
        fluid: f,
        t_c: t_k - K0,
        p_kpa: p_pa / 1000.0,
        q: None,
        h_kj_kg: h,
        s_kj_kg_k: s,
        rho_kg_m3: 1.0 / v,
    })
}

/// Single-phase state at temperature `t_c` °C and pressure `p_kpa` kPa: compressed liquid
/// where p is above the saturation pressure at t, superheated vapour below it, the stable
/// root above the saturation table (near and above the critical point).
///
/// * `t_c` – [`Fluid::t_min_c`]..[`Fluid::t_max_c`]; `p_kpa` – 0.001 kPa..3 pc
///
/// A state exactly on the saturation line comes back as saturated vapour (q = None).
/// Error `OutOfRange` outside. Source: Peng–Robinson (1976), departure functions (`cubic.rs`).
pub fn state_tp(f: Fluid, t_c: f64, p_kpa: f64) -> Result<FluidState> {
    if f == Fluid::Water {
        return steam::state_tp(t_c, p_kpa);
    }
    check_t(f, t_c)?;
    check_p(f, p_kpa)?;
    let d = data(f)?;
    let (t_k, p_pa) = (t_c + K0, p_kpa * 1000.0);
    single_state(f, d, t_k, p_pa, d.phase_at(t_k, p_pa))
}

/// Which of h or s a flash matches (shared with `steam.rs`).
#[derive(Clone, Copy)]
pub(crate) enum Target {
    H,
    S,
}

impl Target {
    /// The quantity matched, for error messages.
    pub(crate) fn quantity(self) -> &'static str {
        match self {
            Target::H => "enthalpy, kJ/kg",
            Target::S => "entropy, kJ/(kg·K)",
        }
    }

    /// `h` or `s`, whichever is matched.
    pub(crate) fn pick(self, h: f64, s: f64) -> f64 {
        match self {
            Target::H => h,
            Target::S => s,
        }
    }
}

fn flash(f: Fluid, p_kpa: f64, value: f64, target: Target) -> Result<FluidState> {
    if f == Fluid::Water {
        return steam::flash(p_kpa, value, target);
    }
    check_p(f, p_kpa)?;
    if !value.is_finite() {
        return Err(out_of_range(
            target.quantity(),
            value,
            "a finite number".into(),
        ));
    }
    let d = data(f)?;
    let p_pa = p_kpa * 1000.0;
    let ln_p = p_pa.ln();
    let pick = |h: f64, s: f64| target.pick(h, s);
    let (t_lo, t_hi, phase) = if ln_p >= d.ln_p_lo() && ln_p <= d.ln_p_hi() {
        let t_s = d.t_at_ln_p(ln_p);
        let r = d.at_t(t_s);
        let (xl, xv) = (pick(r[1], r[3]), pick(r[2], r[4]));
        if value >= xl && value <= xv {
            let q = (value - xl) / (xv - xl);
            let mut s = sat_from_row(t_s, &r);
            s.p_kpa = p_kpa;
            return Ok(two_phase(f, &s, q));
        }
        if value > xv {
            (t_s, d.t_max_k, Some(Phase::Vapour))
        } else {
            (d.t0_k, t_s, Some(Phase::Liquid))
        }
    } else {
        (d.t0_k, d.t_max_k, None)
    };
    let g = |t_k: f64| -> f64 {
        let ph = phase.unwrap_or_else(|| d.phase_at(t_k, p_pa));
        match d.single(t_k, p_pa, ph) {
            Ok((h, s, _)) => pick(h, s) - value,
            Err(_) => f64::NAN,
        }
    };
    let (g_lo, g_hi) = (g(t_lo), g(t_hi));
    if !(g_lo <= 0.0 && g_hi >= 0.0) {
        let (lo_v, hi_v) = (g_lo + value, g_hi + value);
        return Err(out_of_range(
            target.quantity(),
            value,
            format!(
                "{lo_v:.3}..{hi_v:.3} for {} at {p_kpa} kPa ({:.1}..{:.1} °C, range of the model)",
                f.name(),
                t_lo - K0,
                t_hi - K0
            ),
        ));
    }
    let t_k = crate::num::brent("Peng-Robinson flash", t_lo, t_hi, 1e-7, g)?;
    let ph = phase.unwrap_or_else(|| d.phase_at(t_k, p_pa));
    single_state(f, d, t_k, p_pa, ph)
}

/// State at pressure `p_kpa` kPa and specific enthalpy `h_kj_kg` kJ/kg (IIR): two-phase with
/// quality `(h − h_l)/(h_v − h_l)` between the saturated enthalpies, else the single-phase
/// temperature where h(T, p) = h (Brent's method, 1e-7 K).
///
/// Error `OutOfRange` for p outside 0.001 kPa..3 pc or h outside the model's temperature range.
pub fn state_ph(f: Fluid, p_kpa: f64, h_kj_kg: f64) -> Result<FluidState> {
    flash(f, p_kpa, h_kj_kg, Target::H)
}

/// State at pressure `p_kpa` kPa and specific entropy `s_kj_kgk` kJ/(kg·K) (IIR); as
/// [`state_ph`] with entropy.
pub fn state_ps(f: Fluid, p_kpa: f64, s_kj_kgk: f64) -> Result<FluidState> {
    flash(f, p_kpa, s_kj_kgk, Target::S)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// IIR reference state holds for every fluid: h = 200 kJ/kg, s = 1 kJ/(kg·K) for
    /// saturated liquid at 0 °C (definition).
    #[test]
    fn iir_reference_state() {
        for f in Fluid::ALL {
            let s = saturation_direct(f, 0.0).unwrap();
            assert!((s.h_liq_kj_kg - 200.0).abs() < 1e-9, "{f:?}");
            assert!((s.s_liq_kj_kgk - 1.0).abs() < 1e-12, "{f:?}");
            let t = state_tq(f, 0.0, 0.0).unwrap();
            assert!((t.h_kj_kg - 200.0).abs() < 0.02, "{f:?} {}", t.h_kj_kg);
        }
    }

    /// Table against the direct fugacity solve at grid midpoints up to 0.98 Tc: pressure
    /// within 1e-4 relative, enthalpies within 0.02 kJ/kg, inverse T(p) within 0.01 K.
    #[test]
    fn table_matches_direct_solve() {
        for f in Fluid::PENG_ROBINSON {
            let tc = f.t_crit_c() + K0;
            let d = data(f).unwrap();
            let mut worst = (0.0f64, 0.0f64, 0.0f64);
            for i in 0..TABLE_POINTS - 1 {
                let t_k = d.t0_k + d.dt_k * (i as f64 + 0.5);
                if t_k > 0.98 * tc {
                    break;
                }
                let t_c = t_k - K0;
                let a = saturation(f, t_c).unwrap();
                let b = saturation_direct(f, t_c).unwrap();
                worst.0 = worst.0.max((a.p_kpa / b.p_kpa - 1.0).abs());
                worst.1 = worst
                    .1
                    .max((a.h_liq_kj_kg - b.h_liq_kj_kg).abs())
                    .max((a.h_vap_kj_kg - b.h_vap_kj_kg).abs());
                worst.2 = worst
                    .2
                    .max((sat_temperature_c(f, b.p_kpa).unwrap() - t_c).abs());
            }
            assert!(
                worst.0 < 1e-4 && worst.1 < 0.02 && worst.2 < 0.01,
                "{f:?} {worst:?}"
            );
        }
    }

    /// Flashes invert each other: (T, p) → h → (p, h) → T, and (p, s) likewise, in both
    /// single-phase regions; and two-phase (p, h) returns the quality.
    #[test]
    fn flashes_round_trip() {
        let f = Fluid::R245fa;
        let p = sat_pressure_kpa(f, 80.0).unwrap();
        for t in [40.0, 79.0, 81.0, 130.0] {
            let a = state_tp(f, t, p).unwrap();
            let b = state_ph(f, p, a.h_kj_kg).unwrap();
            let c = state_ps(f, p, a.s_kj_kg_k).unwrap();
            assert!((b.t_c - t).abs() < 1e-5 && (c.t_c - t).abs() < 1e-5, "{t}");
            assert!(a.q.is_none());
        }
        assert!(state_tp(f, 40.0, p).unwrap().rho_kg_m3 > 1000.0);
        assert!(state_tp(f, 130.0, p).unwrap().rho_kg_m3 < 100.0);
        let m = state_tq(f, 80.0, 0.3).unwrap();
        // The (p, ·) flashes find T_sat through the table's inverse (within 1e-3 K, measured
        // 2e-4 K here), so the quality comes back to within 1e-5.
        let back = state_ph(f, m.p_kpa, m.h_kj_kg).unwrap();
        assert!((back.q.unwrap() - 0.3).abs() < 1e-5);
        let back = state_ps(f, m.p_kpa, m.s_kj_kg_k).unwrap();
        assert!((back.q.unwrap() - 0.3).abs() < 1e-5);
        let pq = state_pq(f, p, 1.0).unwrap();
        assert!((pq.t_c - 80.0).abs() < 0.01);
    }

    #[test]
    fn bad_input_errors() {
        let e = Fluid::from_name("R22").unwrap_err().to_string();
        assert!(e.contains("R245fa") && e.contains("R1234ze(E)"), "{e}");
        assert_eq!(Fluid::from_name("Propane").unwrap(), Fluid::R290);
        assert_eq!(Fluid::from_name("r1233zd(e)").unwrap(), Fluid::R1233zdE);
        for f in Fluid::ALL {
            assert_eq!(Fluid::from_name(f.name()).unwrap(), f);
        }
        let f = Fluid::R134a;
        assert!(sat_pressure_kpa(f, 150.0).is_err()); // above Tc
        assert!(sat_pressure_kpa(f, -150.0).is_err());
        assert!(sat_pressure_kpa(f, f64::NAN).is_err());
        assert!(sat_temperature_c(f, 1e9).is_err());
        assert!(state_tp(f, 20.0, -1.0).is_err());
        assert!(state_tp(f, 900.0, 100.0).is_err());
        assert!(state_ph(f, 500.0, 1e6).is_err());
        assert!(state_ph(f, 500.0, f64::NAN).is_err());
        assert!(state_tq(f, 0.0, 1.5).is_err());
    }

    /// Above the critical pressure the (p, h) flash still works (single stable root).
    #[test]
    fn supercritical_flash() {
        let f = Fluid::R134a;
        let p = 1.2 * f.p_crit_kpa();
        let a = state_tp(f, 130.0, p).unwrap();
        let b = state_ph(f, p, a.h_kj_kg).unwrap();
        assert!((b.t_c - 130.0).abs() < 1e-4, "{}", b.t_c);
    }
}
