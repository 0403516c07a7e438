//! Aqueous lithium bromide (LiBr–H2O) solution properties by Pátek & Klomfar (2006).
//!
//! Temperatures °C, pressures kPa, `x` the LiBr mass fraction (kg LiBr / kg solution),
//! enthalpy kJ/kg, cp kJ/(kg·K), entropy kJ/(kg·K), density kg/m³.
//!
//! The formulation (J. Pátek, J. Klomfar, "A computationally effective formulation of the
//! thermodynamic properties of LiBr–H2O solutions from 273 to 500 K over full composition
//! range", Int. J. Refrigeration 29 (2006) 566–578) writes each property as the pure-water
//! saturated-liquid value weighted by the water mole fraction plus a salt term:
//! * vapour pressure (eq. 1): `p = p_s,w(Θ)`, `Θ = T − Σ a_i x̃^m_i (0.4 − x̃)^n_i (T/T_c)^t_i`
//!   (Table 4), `x̃` the LiBr mole fraction, `p_s,w` the water saturation pressure;
//! * density (eq. 2): `ρ̃ = (1 − x̃) ρ̃'_w + ρ̃_c Σ a_i x̃^m_i (T/T_c)^t_i` (Table 5, molar);
//! * cp (eq. 3): `c̃_p = (1 − x̃) c̃'_p,w + c̃_p,t Σ a_i x̃^m_i (0.4 − x̃)^n_i (T_c/(T − T_0))^t_i`
//!   (Table 6);
//! * enthalpy (eq. 4): `h̃ = (1 − x̃) h̃'_w + h̃_c Σ a_i x̃^m_i (0.4 − x̃)^n_i (T_c/(T − T_0))^t_i`
//!   (Table 7);
//! * entropy (eq. 5): as enthalpy with `s̃_c` and Table 8.
//!
//! Molar values are turned into mass values with the solution's molar mass
//! `M = x̃ M_LiBr + (1 − x̃) M_w`. Constants (P&K §2): `T_c = 647.096 K`, `T_0 = 221 K`,
//! `ρ̃_c = 17 873.727 mol/m³`, `c̃_p,t = 76.0226 J/(mol·K)`, `h̃_c = 37 548.5 J/mol`,
//! `s̃_c = 79.3933 J/(mol·K)`, `M_w = 0.018015268 kg/mol`, `M_LiBr = 0.08685 kg/mol`.
//! Coefficient tables 4–8 and these constants are copied from absorptionlib 1.1.0 (PyPI),
//! `absorptionlib/LiBr/functions.py`, class `Params_PK`, which reproduces the paper's tables.
//!
//! Pure-water terms: `p_s,w` is the IAPWS-IF97 region-4 saturation-pressure equation (R7-97
//! eq. 30) evaluated in closed form here (it is also what absorptionlib 1.1.0 uses; at
//! `Θ` below 273.16 K — concentrated solutions at low temperature — the equation is
//! evaluated for metastable subcooled water, as in absorptionlib). The saturated-liquid
//! `h'_w`, `c'_p,w`, `ρ'_w` come from IF97 (`seuif97` 2.3.8, saturated liquid, x = 0);
//! the paper uses IAPWS-95 saturated-liquid values there — the two agree to about 1e-4
//! relative over 0..227 °C (IF97 accuracy).
//!
//! Reference state (as in P&K): that of the water formulation, u = s = 0 for saturated liquid
//! water at the triple point; at `x = 0` the solution enthalpy is that of saturated liquid water.
//!
//! Validity (implemented): 0.01 °C (273.16 K, the triple point: the water terms need liquid
//! water) to 226.85 °C (500 K), `0 ≤ x ≤ 0.75`. Outside → [`Error::OutOfRange`], no
//! extrapolation. The formulation does not know crystallisation: states below the
//! crystallisation line are metastable; [`crystallisation_temperature_c`] tells where it is.

use crate::error::{Error, Result};
use seuif97::{OCP, OD, OH, OS};

/// Lowest temperature accepted, °C (triple point of water, 273.16 K).
pub const T_MIN_C: f64 = 0.01;
/// Highest temperature accepted, °C (500 K, P&K upper limit).
pub const T_MAX_C: f64 = 226.85;
/// Highest LiBr mass fraction accepted (P&K "full composition range" ends at 0.75).
pub const X_MAX: f64 = 0.75;
/// Lowest mass fraction of the crystallisation fit (absorptionlib 1.1.0).
pub const X_CRYST_MIN: f64 = 0.5681;

const MODEL: &str = "LiBr-H2O (Patek & Klomfar 2006)";

// Constants, P&K 2006 §2 (via absorptionlib 1.1.0 `Params_PK`).
const T_CRIT_K: f64 = 647.096;
const T0_K: f64 = 221.0;
const RHO_CRIT_MOL_M3: f64 = 17_873.727;
const CP_T_J_MOLK: f64 = 76.0226;
const H_CRIT_J_MOL: f64 = 37_548.5;
const S_CRIT_J_MOLK: f64 = 79.3933;
const M_W: f64 = 0.018_015_268;
const M_LIBR: f64 = 0.086_85;

// Table 4: vapour pressure, (a_i in K, m_i, n_i, t_i). Source: P&K 2006 Table 4
// (absorptionlib 1.1.0 Params_PK.aTab4/mTab4/nTab4/tTab4).
const TAB4: [(f64, i32, i32, i32); 8] = [
    (-241.303, 3, 0, 0),
    (19_175_000.0, 4, 5, 0),
    (-175_521_000.0, 4, 6, 0),
    (32_543_000.0, 8, 3, 0),
    (392.571, 1, 0, 1),
    (-2126.26, 1, 2, 1),
    (185_127_000.0, 4, 6, 1),
    (1912.16, 6, 0, 1),
];

// Table 5: density, (a_i, m_i, t_i). Source: P&K 2006 Table 5 (absorptionlib 1.1.0 aTab5...).
const TAB5: [(f64, i32, i32); 2] = [(1.746, 1, 0), (4.709, 1, 6)];

// Table 6: specific heat, (a_i, m_i, n_i, t_i). Source: P&K 2006 Table 6 (absorptionlib 1.1.0).
const TAB6: [(f64, i32, i32, i32); 8] = [
    (-14.2094, 2, 0, 0),
    (40.4943, 3, 0, 0),
    (111.135, 3, 1, 0),
    (229.98, 3, 2, 0),
    (1345.26, 3, 3, 0),
    (-0.014101, 2, 0, 2),
    (0.0124977, 1, 3, 3),
    (-0.000683209, 1, 2, 4),
];

// Table 7: enthalpy, (a_i, m_i, n_i, t_i). Source: P&K 2006 Table 7 (absorptionlib 1.1.0).
const TAB7: [(f64, i32, i32, i32); 30] = [
    (2.27431, 1, 0, 0),
    (-7.99511, 1, 1, 0),
    (385.239, 2, 6, 0),
    (-16394.0, 3, 6, 0),
    (-422.562, 6, 2, 0),
    (0.113314, 1, 0, 1),
    (-8.33474, 3, 0, 1),
    (-17383.3, 5, 4, 1),
    (6.49763, 4, 0, 2),
    (3245.52, 5, 4, 2),
    (-13464.3, 5, 5, 2),
    (39932.2, 6, 5, 2),
    (-258877.0, 6, 6, 2),
    (-0.00193046, 1, 0, 3),
    (2.80616, 2, 3, 3),
    (-40.4479, 2, 5, 3),
    (145.342, 2, 7, 3),
    (-2.74873, 5, 0, 3),
    (-449.743, 6, 3, 3),
    (-12.1794, 7, 1, 3),
    (-0.00583739, 1, 0, 4),
    (0.23391, 1, 4, 4),
    (0.341888, 2, 2, 4),
    (8.85259, 2, 6, 4),
    (-17.8731, 2, 7, 4),
    (0.0735179, 3, 0, 4),
    (-0.00017943, 1, 0, 5),
    (0.00184261, 1, 1, 5),
    (-0.00624282, 1, 2, 5),
    (0.00684765, 1, 3, 5),
];

// Table 8: entropy, (a_i, m_i, n_i, t_i). Source: P&K 2006 Table 8 (absorptionlib 1.1.0).
const TAB8: [(f64, i32, i32, i32); 29] = [
    (1.53091, 1, 0, 0),
    (-4.52564, 1, 1, 0),
    (698.302, 2, 6, 0),
    (-21666.4, 3, 6, 0),
    (-1475.33, 6, 2, 0),
    (0.0847012, 1, 0, 1),
    (-6.59523, 3, 0, 1),
    (-29533.1, 5, 4, 1),
    (0.00956314, 1, 0, 2),
    (-0.188679, 2, 0, 2),
    (9.31752, 2, 4, 2),
    (5.78104, 4, 0, 2),
    (13893.1, 5, 4, 2),
    (-17176.2, 5, 5, 2),
    (415.108, 6, 2, 2),
    (-55564.7, 6, 5, 2),
    (-0.00423409, 1, 0, 3),
    (30.5242, 3, 4, 3),
    (-1.6762, 5, 0, 3),
    (14.8283, 7, 1, 3),
    (0.00303055, 1, 0, 4),
    (-0.040181, 1, 2, 4),
    (0.149252, 1, 4, 4),
    (2.5924, 2, 7, 4),
    (-0.177421, 3, 1, 4),
    (-0.000069965, 1, 0, 5),
    (0.000605007, 1, 1, 5),
    (-0.00165228, 1, 2, 5),
    (0.00122966, 1, 3, 5),
];

// IAPWS-IF97 region 4 coefficients n1..n10, R7-97 Table 34.
const N4: [f64; 10] = [
    0.116_705_214_527_67e4,
    -0.724_213_167_032_06e6,
    -0.170_738_469_400_92e2,
    0.120_208_247_024_70e5,
    -0.323_255_503_223_33e7,
    0.149_151_086_135_30e2,
    -0.482_326_573_615_91e4,
    0.405_113_405_420_57e6,
    -0.238_555_575_678_49,
    0.650_175_348_447_98e3,
];

/// IF97 eq. 30, saturation pressure of water at `t_k`, kPa (closed form, no range check:
/// callers keep `t_k` within 200..647 K).
fn psat_water_kpa(t_k: f64) -> f64 {
    let v = t_k + N4[8] / (t_k - N4[9]);
    let a = v * v + N4[0] * v + N4[1];
    let b = N4[2] * v * v + N4[3] * v + N4[4];
    let c = N4[5] * v * v + N4[6] * v + N4[7];
    let r = 2.0 * c / (-b + (b * b - 4.0 * a * c).sqrt());
    r.powi(4) * 1000.0
}

/// IF97 eq. 31, saturation temperature of water at `p_kpa`, K (closed form).
fn tsat_water_k(p_kpa: f64) -> f64 {
    let beta = (p_kpa / 1000.0).powf(0.25);
    let e = beta * beta + N4[2] * beta + N4[5];
    let f = N4[0] * beta * beta + N4[3] * beta + N4[6];
    let g = N4[1] * beta * beta + N4[4] * beta + N4[7];
    let d = 2.0 * g / (-f - (f * f - 4.0 * e * g).sqrt());
    (N4[9] + d - ((N4[9] + d).powi(2) - 4.0 * (N4[8] + N4[9] * d)).sqrt()) / 2.0
}

fn check_t(t_c: f64) -> Result<()> {
    if t_c.is_finite() && (T_MIN_C..=T_MAX_C).contains(&t_c) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: MODEL,
            quantity: "temperature, °C",
            value: t_c,
            range: format!("{T_MIN_C}..{T_MAX_C} °C (273.16..500 K)"),
        })
    }
}

fn check_x(x: f64) -> Result<()> {
    if x.is_finite() && (0.0..=X_MAX).contains(&x) {
        Ok(())
    } else {
        Err(Error::OutOfRange {
            model: MODEL,
            quantity: "LiBr mass fraction",
            value: x,
            range: format!("0..{X_MAX} kg/kg"),
        })
    }
}

/// LiBr mole fraction from mass fraction.
fn mole_fraction(x: f64) -> f64 {
    let nl = x / M_LIBR;
    nl / (nl + (1.0 - x) / M_W)
}

/// Σ a x̃^m (0.4 − x̃)^n τ^t for a 4-column table.
fn sum4(tab: &[(f64, i32, i32, i32)], xm: f64, tau: f64) -> f64 {
    let (xp, dp, tp) = (powers(xm), powers(0.4 - xm), powers(tau));
    tab.iter()
        .map(|&(a, m, n, t)| a * xp[m as usize] * dp[n as usize] * tp[t as usize])
        .sum()
}

/// Largest exponent in Tables 4–8 plus one (the tables' exponents are checked against it in
/// the tests).
const N_POW: usize = 9;

/// `v^0 .. v^8` by repeated multiplication: the tables' integer powers without a `powi`
/// call per term (agrees with `powi` to a few ulp).
fn powers(v: f64) -> [f64; N_POW] {
    let mut p = [1.0; N_POW];
    for k in 1..N_POW {
        p[k] = p[k - 1] * v;
    }
    p
}

/// Vapour-pressure temperature offset parts: Θ = T − (A + B·T/T_c).
fn theta_parts(xm: f64) -> (f64, f64) {
    let (xp, dp) = (powers(xm), powers(0.4 - xm));
    let mut a = 0.0;
    let mut b = 0.0;
    for &(c, m, n, t) in &TAB4 {
        let term = c * xp[m as usize] * dp[n as usize];
        if t == 0 { a += term } else { b += term }
    }
    (a, b)
}

/// Saturated liquid water from IF97 directly: `[h kJ/kg, s kJ/(kg·K), ρ kg/m³, cp kJ/(kg·K)]`.
fn sat_liquid_if97(t_c: f64) -> Result<[f64; 4]> {
    let mut out = [0.0; 4];
    for (o, (what, name)) in out.iter_mut().zip([
        (OH, "enthalpy"),
        (OS, "entropy"),
        (OD, "density"),
        (OCP, "cp"),
    ]) {
        let v = seuif97::tx(t_c, 0.0, what);
        if !(v.is_finite() && v > -1e9) {
            return Err(Error::Internal(format!(
                "seuif97 returned {v} for saturated-liquid {name} at {t_c} °C"
            )));
        }
        *o = v;
    }
    Ok(out)
}

/// Spacing of the saturated-liquid table, K.
const SAT_STEP_K: f64 = 0.05;

/// The saturated-liquid properties of water the solution's equations take, IF97 at
/// `T_MIN_C + k·SAT_STEP_K` up to just past `T_MAX_C`, built once per process (about 4600
/// points, a few milliseconds).
fn sat_table() -> Result<&'static [[f64; 4]]> {
    static TABLE: std::sync::OnceLock<std::result::Result<Vec<[f64; 4]>, String>> =
        std::sync::OnceLock::new();
    TABLE
        .get_or_init(|| {
            let n = ((T_MAX_C - T_MIN_C) / SAT_STEP_K).ceil() as usize + 3;
            (0..n)
                .map(|k| sat_liquid_if97((T_MIN_C + k as f64 * SAT_STEP_K).min(370.0)))
                .collect::<Result<Vec<_>>>()
                .map_err(|e| e.to_string())
        })
        .as_deref()
        .map_err(|e| Error::Internal(e.clone()))
}

/// Saturated liquid water at `t_c` (in `T_MIN_C..=T_MAX_C`): `[h, s, ρ, cp]` as
/// [`sat_liquid_if97`], by four-point (cubic) Lagrange interpolation in the IF97 table.
/// Measured error against IF97 directly (test `sat_table_matches_if97`): below 1e-11
/// relative for each property over the whole range (h and s below 1 kJ/kg (kJ/(kg·K)) near
/// the triple point: below 1e-11 absolute; measured 7e-12 in h, 2e-13 in cp).
fn sat_liquid(t_c: f64) -> Result<[f64; 4]> {
    let tab = sat_table()?;
    let u = (t_c - T_MIN_C) / SAT_STEP_K;
    // Nodes i−1, i, i+1, i+2 around u (clamped at the ends of the table).
    let i = (u.floor() as usize).clamp(1, tab.len() - 3);
    let f = u - i as f64;
    let w = [
        -f * (f - 1.0) * (f - 2.0) / 6.0,
        (f + 1.0) * (f - 1.0) * (f - 2.0) / 2.0,
        -(f + 1.0) * f * (f - 2.0) / 2.0,
        (f + 1.0) * f * (f - 1.0) / 6.0,
    ];
    let mut out = [0.0; 4];
    for (k, wk) in w.iter().enumerate() {
        for (o, v) in out.iter_mut().zip(tab[i - 1 + k]) {
            *o += wk * v;
        }
    }
    Ok(out)
}

/// Equilibrium water-vapour pressure over a LiBr–H2O solution, kPa.
///
/// P&K 2006 eq. 1: `p = p_s,w(Θ)`, `Θ = T − Σ a_i x̃^m_i (0.4 − x̃)^n_i (T/T_c)^t_i` (Table 4),
/// with `p_s,w` the IAPWS-IF97 saturation-pressure equation (R7-97 eq. 30).
///
/// * `t_c` – solution temperature, °C, 0.01..=226.85
/// * `x` – LiBr mass fraction, kg/kg, 0..=0.75 (0 gives pure water)
///
/// `OutOfRange` outside those ranges. Source: Pátek & Klomfar, Int. J. Refrig. 29 (2006)
/// 566–578, eq. 1 and Table 4; IAPWS R7-97(2012) eq. 30.
pub fn vapour_pressure_kpa(t_c: f64, x: f64) -> Result<f64> {
    check_t(t_c)?;
    check_x(x)?;
    let t_k = t_c + 273.15;
    let (a, b) = theta_parts(mole_fraction(x));
    Ok(psat_water_kpa(t_k - a - b * t_k / T_CRIT_K))
}

/// P&K 2006 eq. 1 at one mass fraction, solved for the solution temperature: the
/// equilibrium temperature of the solution is linear in the saturation temperature Θ of pure
/// water at the same pressure, `T = (Θ + A)/(1 − B/T_c)` (a Dühring line; Table 4 exponents
/// `t_i` are 0 or 1). The absorption cycle, whose two pressures are the water saturation
/// pressures at its evaporating and condensing temperatures, takes its four solution
/// temperatures from two of these lines without passing through the pressures.
#[derive(Debug, Clone, Copy)]
pub struct DuhringLine {
    a: f64,
    b: f64,
}

impl DuhringLine {
    /// The line of mass fraction `x` (0..=0.75; `OutOfRange` outside).
    pub fn new(x: f64) -> Result<DuhringLine> {
        check_x(x)?;
        let (a, b) = theta_parts(mole_fraction(x));
        Ok(DuhringLine { a, b })
    }

    /// Solution temperature, °C, in equilibrium with water vapour at the saturation
    /// pressure of pure water at `t_water_c` (°C). `OutOfRange` when the result is outside
    /// 0.01..=226.85 °C.
    pub fn solution_temperature_c(&self, t_water_c: f64) -> Result<f64> {
        self.at_theta_k(t_water_c + 273.15)
    }

    fn at_theta_k(&self, theta_k: f64) -> Result<f64> {
        let t_c = (theta_k + self.a) / (1.0 - self.b / T_CRIT_K) - 273.15;
        check_t(t_c)?;
        Ok(t_c)
    }
}

/// Solution temperature at equilibrium with water vapour at `p_kpa`, °C (the boiling
/// temperature of the solution).
///
/// Inverse of [`vapour_pressure_kpa`]. Because the Table 4 exponents `t_i` are 0 or 1,
/// `Θ = T − A(x̃) − B(x̃) T/T_c` is linear in T: `T = (Θ + A)/(1 − B/T_c)` with
/// `Θ = T_s,w(p)` from IF97 eq. 31 — closed form, no iteration.
///
/// * `p_kpa` – pressure, kPa (0.1..=22 064)
/// * `x` – LiBr mass fraction, kg/kg, 0..=0.75
///
/// `OutOfRange` when the pressure is outside its range or the resulting temperature lies
/// outside 0.01..226.85 °C. Source: P&K 2006 eq. 1; IAPWS R7-97(2012) eq. 31.
pub fn temperature_c(p_kpa: f64, x: f64) -> Result<f64> {
    check_x(x)?;
    if !(p_kpa.is_finite() && (0.1..=22_064.0).contains(&p_kpa)) {
        return Err(Error::OutOfRange {
            model: MODEL,
            quantity: "pressure, kPa",
            value: p_kpa,
            range: "0.1..22064 kPa".into(),
        });
    }
    DuhringLine::new(x)?.at_theta_k(tsat_water_k(p_kpa))
}

/// Equilibrium LiBr mass fraction of a solution at `t_c` under water-vapour pressure `p_kpa`.
///
/// Root in x of `vapour_pressure_kpa(t_c, x) = p_kpa` by Brent's method on 0..0.75 to 1e-12.
///
/// * `p_kpa` – pressure, kPa; `t_c` – temperature, °C (0.01..=226.85)
///
/// `OutOfRange` when `p_kpa` is not between the vapour pressures at x = 0.75 and x = 0 (pure
/// water) at `t_c`. Source: P&K 2006 eq. 1.
pub fn mass_fraction(p_kpa: f64, t_c: f64) -> Result<f64> {
    let p0 = vapour_pressure_kpa(t_c, 0.0)?;
    let p1 = vapour_pressure_kpa(t_c, X_MAX)?;
    if !(p_kpa.is_finite() && p_kpa >= p1 && p_kpa <= p0) {
        return Err(Error::OutOfRange {
            model: MODEL,
            quantity: "pressure, kPa",
            value: p_kpa,
            range: format!(
                "{p1:.5}..{p0:.5} kPa at {t_c} °C (vapour pressure of x = 0.75 up to pure water)"
            ),
        });
    }
    let t_k = t_c + 273.15;
    crate::num::brent("LiBr mass fraction", 0.0, X_MAX, 1e-12, |x| {
        let (a, b) = theta_parts(mole_fraction(x));
        psat_water_kpa(t_k - a - b * t_k / T_CRIT_K) - p_kpa
    })
}

/// Specific enthalpy of the solution, kJ/kg.
///
/// P&K 2006 eq. 4 (Table 7): `h̃ = (1 − x̃) h̃'_w(T) + h̃_c Σ a_i x̃^m_i (0.4 − x̃)^n_i
/// (T_c/(T − T_0))^t_i`, divided by the molar mass of the solution; `h'_w` saturated liquid
/// water (IF97). Reference state: saturated liquid water at the triple point has u = s = 0
/// (so h(x = 0) = h'_w).
///
/// * `t_c` – °C, 0.01..=226.85; `x` – LiBr mass fraction, 0..=0.75
///
/// `OutOfRange` outside. Source: Pátek & Klomfar 2006, eq. 4, Table 7.
pub fn enthalpy_kj_kg(t_c: f64, x: f64) -> Result<f64> {
    check_t(t_c)?;
    check_x(x)?;
    let xm = mole_fraction(x);
    let tau = T_CRIT_K / (t_c + 273.15 - T0_K);
    let hw_mol = sat_liquid(t_c)?[0] * M_W * 1000.0; // J/mol
    let h_mol = (1.0 - xm) * hw_mol + H_CRIT_J_MOL * sum4(&TAB7, xm, tau);
    Ok(h_mol / (xm * M_LIBR + (1.0 - xm) * M_W) / 1000.0)
}

/// Specific entropy of the solution, kJ/(kg·K), same reference state as the enthalpy.
///
/// P&K 2006 eq. 5 (Table 8): `s̃ = (1 − x̃) s̃'_w(T) + s̃_c Σ a_i x̃^m_i (0.4 − x̃)^n_i
/// (T_c/(T − T_0))^t_i`; `s'_w` saturated liquid water (IF97).
///
/// * `t_c` – °C, 0.01..=226.85; `x` – LiBr mass fraction, 0..=0.75
///
/// `OutOfRange` outside. Source: Pátek & Klomfar 2006, eq. 5, Table 8.
pub fn entropy_kj_kgk(t_c: f64, x: f64) -> Result<f64> {
    check_t(t_c)?;
    check_x(x)?;
    let xm = mole_fraction(x);
    let tau = T_CRIT_K / (t_c + 273.15 - T0_K);
    let sw_mol = sat_liquid(t_c)?[1] * M_W * 1000.0;
    let s_mol = (1.0 - xm) * sw_mol + S_CRIT_J_MOLK * sum4(&TAB8, xm, tau);
    Ok(s_mol / (xm * M_LIBR + (1.0 - xm) * M_W) / 1000.0)
}

/// Density of the solution, kg/m³.
///
/// P&K 2006 eq. 2 (Table 5): `ρ̃ = (1 − x̃) ρ̃'_w(T) + ρ̃_c Σ a_i x̃^m_i (T/T_c)^t_i` in mol/m³,
/// times the molar mass of the solution; `ρ'_w` saturated liquid water (IF97).
///
/// * `t_c` – °C, 0.01..=226.85; `x` – LiBr mass fraction, 0..=0.75
///
/// `OutOfRange` outside. Source: Pátek & Klomfar 2006, eq. 2, Table 5.
pub fn density_kg_m3(t_c: f64, x: f64) -> Result<f64> {
    check_t(t_c)?;
    check_x(x)?;
    let xm = mole_fraction(x);
    let th = (t_c + 273.15) / T_CRIT_K;
    let rw_mol = sat_liquid(t_c)?[2] / M_W;
    let (xp, tp) = (powers(xm), powers(th));
    let s: f64 = TAB5
        .iter()
        .map(|&(a, m, t)| a * xp[m as usize] * tp[t as usize])
        .sum();
    let r_mol = (1.0 - xm) * rw_mol + RHO_CRIT_MOL_M3 * s;
    Ok(r_mol * (xm * M_LIBR + (1.0 - xm) * M_W))
}

/// Isobaric specific heat of the solution, kJ/(kg·K).
///
/// P&K 2006 eq. 3 (Table 6): `c̃_p = (1 − x̃) c̃'_p,w(T) + c̃_p,t Σ a_i x̃^m_i (0.4 − x̃)^n_i
/// (T_c/(T − T_0))^t_i`; `c'_p,w` saturated liquid water (IF97).
///
/// * `t_c` – °C, 0.01..=226.85; `x` – LiBr mass fraction, 0..=0.75
///
/// `OutOfRange` outside. Source: Pátek & Klomfar 2006, eq. 3, Table 6.
pub fn cp_kj_kgk(t_c: f64, x: f64) -> Result<f64> {
    check_t(t_c)?;
    check_x(x)?;
    let xm = mole_fraction(x);
    let tau = T_CRIT_K / (t_c + 273.15 - T0_K);
    let cw_mol = sat_liquid(t_c)?[3] * M_W * 1000.0;
    let c_mol = (1.0 - xm) * cw_mol + CP_T_J_MOLK * sum4(&TAB6, xm, tau);
    Ok(c_mol / (xm * M_LIBR + (1.0 - xm) * M_W) / 1000.0)
}

/// Crystallisation (solubility) temperature of a LiBr–H2O solution, °C: below it LiBr hydrate
/// crystallises out of a solution of mass fraction `x`.
///
/// Polynomial of degree 7 in `x̂ = (x − 0.660036363636364)/0.0521377438043144`, fitted to
/// Boryta's solubility data; coefficients from absorptionlib 1.1.0 (PyPI),
/// `LiBr.solubility_temperature` (sources named there: D. A. Boryta, "Solubility of lithium
/// bromide in water between −50 and +100 °C (45 to 70 % lithium bromide)", J. Chem. Eng. Data
/// 15 (1970) 142–144; G. Feuerecker, Entropieanalyse für Wärmepumpensysteme, TU München 1994).
///
/// * `x` – LiBr mass fraction, 0.5681..=0.75 (the fit's range; about 1.5 °C to 140 °C)
///
/// `OutOfRange` outside that range (below 0.5681 the solution freezes or crystallises only
/// below about 1.5 °C, colder than any absorption machine runs).
pub fn crystallisation_temperature_c(x: f64) -> Result<f64> {
    if !(x.is_finite() && (X_CRYST_MIN..=X_MAX).contains(&x)) {
        return Err(Error::OutOfRange {
            model: "LiBr-H2O crystallisation line (Boryta 1970 fit)",
            quantity: "LiBr mass fraction",
            value: x,
            range: format!("{X_CRYST_MIN}..{X_MAX} kg/kg"),
        });
    }
    // Coefficients of x̂^7 .. x̂^0, absorptionlib 1.1.0 solubility_temperature.
    const C: [f64; 8] = [
        -1.253_540_434_370_46,
        1.605_351_429_808_59,
        9.501_324_608_337_96,
        -10.971_809_517_544_5,
        -23.092_448_339_318_1,
        23.937_621_187_067_3,
        57.416_668_290_776_3,
        55.011_001_335_038_6,
    ];
    let xh = (x - 0.660_036_363_636_364) / 0.052_137_743_804_314_4;
    Ok(C.iter().fold(0.0, |acc, c| acc * xh + c))
}

/// A whole solution state, for the `state libr` verb.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LibrState {
    /// Temperature, °C.
    pub t_c: f64,
    /// Equilibrium water-vapour pressure, kPa.
    pub p_kpa: f64,
    /// LiBr mass fraction, kg/kg.
    pub x: f64,
    /// Specific enthalpy, kJ/kg (P&K reference state).
    pub h_kj_kg: f64,
    /// Specific entropy, kJ/(kg·K).
    pub s_kj_kgk: f64,
    /// Density, kg/m³.
    pub rho_kg_m3: f64,
    /// Specific heat, kJ/(kg·K).
    pub cp_kj_kgk: f64,
    /// Crystallisation temperature, °C; `None` below x = 0.5681 (outside the fit).
    pub t_cryst_c: Option<f64>,
}

/// Solution state from temperature and mass fraction.
///
/// * `t_c` – °C, 0.01..=226.85; `x` – LiBr mass fraction, 0..=0.75
///
/// All properties by P&K 2006 (see the module docs); `OutOfRange` outside the ranges.
pub fn state_tx(t_c: f64, x: f64) -> Result<LibrState> {
    Ok(LibrState {
        t_c,
        p_kpa: vapour_pressure_kpa(t_c, x)?,
        x,
        h_kj_kg: enthalpy_kj_kg(t_c, x)?,
        s_kj_kgk: entropy_kj_kgk(t_c, x)?,
        rho_kg_m3: density_kg_m3(t_c, x)?,
        cp_kj_kgk: cp_kj_kgk(t_c, x)?,
        t_cryst_c: crystallisation_temperature_c(x).ok(),
    })
}

/// Saturated solution state from pressure and mass fraction (temperature by
/// [`temperature_c`]).
///
/// * `p_kpa` – kPa; `x` – LiBr mass fraction, 0..=0.75
///
/// `OutOfRange` when the equilibrium temperature leaves 0.01..226.85 °C.
pub fn state_px(p_kpa: f64, x: f64) -> Result<LibrState> {
    state_tx(temperature_c(p_kpa, x)?, x)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The Dühring form agrees with the pressure form through IF97's saturation pressure.
    #[test]
    fn duhring_line_matches_pressure_form() {
        for x in [0.0, 0.45, 0.55, 0.62, 0.7] {
            let line = DuhringLine::new(x).unwrap();
            for t_w in [2.0, 5.0, 10.0, 35.0, 45.0] {
                let p = crate::props::water::saturation_pressure_kpa(t_w).unwrap();
                let a = line.solution_temperature_c(t_w).unwrap();
                let b = temperature_c(p, x).unwrap();
                assert!((a - b).abs() < 1e-9, "x {x}, {t_w} °C: {a} vs {b}");
            }
        }
        assert!(DuhringLine::new(0.8).is_err());
    }

    /// The tabulated saturated liquid against IF97 directly at 20 000 points between the
    /// nodes, and at the ends of the range.
    #[test]
    fn sat_table_matches_if97() {
        let mut worst = [0.0f64; 4];
        let n = 20_000;
        for k in 0..=n {
            // An irrational fraction of the step, so points fall everywhere between nodes.
            let t = (T_MIN_C + (T_MAX_C - T_MIN_C) * (k as f64 * 0.618_033_988_749_9 % 1.0))
                .clamp(T_MIN_C, T_MAX_C);
            let t = if k == 0 {
                T_MIN_C
            } else if k == n {
                T_MAX_C
            } else {
                t
            };
            let a = sat_liquid(t).unwrap();
            let b = sat_liquid_if97(t).unwrap();
            for j in 0..4 {
                // h and s are zero near the triple point (the reference state): there the
                // error is taken relative to 1 kJ/kg (kJ/(kg·K)).
                let scale = if j < 2 {
                    b[j].abs().max(1.0)
                } else {
                    b[j].abs()
                };
                worst[j] = worst[j].max((a[j] - b[j]).abs() / scale);
            }
        }
        eprintln!("worst relative error h, s, rho, cp: {worst:?}");
        assert!(worst.iter().all(|&e| e < 1e-11), "{worst:?}");
    }

    #[test]
    fn table_exponents_fit_the_power_arrays() {
        let four = TAB4.iter().chain(&TAB6).chain(&TAB7).chain(&TAB8);
        for &(_, m, n, t) in four {
            assert!([m, n, t].iter().all(|&e| (0..N_POW as i32).contains(&e)));
        }
        for &(_, m, t) in &TAB5 {
            assert!([m, t].iter().all(|&e| (0..N_POW as i32).contains(&e)));
        }
        let p = powers(0.37);
        for (k, v) in p.iter().enumerate() {
            assert!((v - 0.37f64.powi(k as i32)).abs() < 1e-15);
        }
    }

    #[test]
    fn pure_water_limit() {
        // x = 0: IF97 saturation pressure and saturated-liquid enthalpy.
        // IAPWS R7-97 Table 35: p_s(300 K) = 3.53658941 kPa.
        let p = vapour_pressure_kpa(300.0 - 273.15, 0.0).unwrap();
        assert!((p - 3.536_589_41).abs() < 1e-6);
        let t = temperature_c(p, 0.0).unwrap();
        assert!((t - 26.85).abs() < 1e-6);
    }

    #[test]
    fn inverses_round_trip() {
        for &(t, x) in &[(40.0, 0.55), (90.0, 0.62), (150.0, 0.7), (25.0, 0.45)] {
            let p = vapour_pressure_kpa(t, x).unwrap();
            assert!((temperature_c(p, x).unwrap() - t).abs() < 1e-9);
            assert!((mass_fraction(p, t).unwrap() - x).abs() < 1e-9);
        }
    }

    #[test]
    fn out_of_range_is_error() {
        assert!(vapour_pressure_kpa(-1.0, 0.5).is_err());
        assert!(vapour_pressure_kpa(230.0, 0.5).is_err());
        assert!(enthalpy_kj_kg(50.0, 0.76).is_err());
        assert!(cp_kj_kgk(f64::NAN, 0.5).is_err());
        assert!(crystallisation_temperature_c(0.5).is_err());
        assert!(mass_fraction(50.0, 30.0).is_err()); // above pure-water pressure
        assert!(temperature_c(1e5, 0.5).is_err());
    }

    #[test]
    fn crystallisation_line_boryta() {
        // absorptionlib 1.1.0 solubility_temperature(0.65) = 44.9927 °C (fit of Boryta 1970).
        let t = crystallisation_temperature_c(0.65).unwrap();
        assert!((t - 44.992_707_675).abs() < 1e-6);
    }
}
