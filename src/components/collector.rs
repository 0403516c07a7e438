//! Solar thermal collector: the ISO 9806:2017 collector model for the useful power per m²,
//! with a beam incidence angle modifier (IAM) and a diffuse IAM.
//!
//! Useful power per m² of the area basis (aperture or gross, whichever the coefficients were
//! measured on), at mean fluid temperature `ϑm`, in the quasi-dynamic form:
//!
//! `q = η0,b Kθb(θ) Gb + η0,b Kθd Gd − c6 u G − c1 (ϑm − ϑa) − c2 (ϑm − ϑa)²
//!      − c3 u (ϑm − ϑa) + c4 (EL − σ Ta⁴) − c5 dϑm/dt`
//!
//! with `G = Gb + Gd` the hemispherical irradiance on the collector plane, `u` the wind speed
//! (m/s), `EL` the long-wave irradiance (W/m²) and `Ta` the air temperature in kelvin.
//!
//! Source: ISO 9806:2017, *Solar energy — Solar thermal collectors — Test methods*, the
//! quasi-dynamic collector model. The standard's text could not be read here: the equation and
//! its symbols are from memory, checked against what could be read: the IDEAS Modelica
//! library's `ISO9806QuasiDynamicHeatLoss` (citing ISO 9806:2013) writes the heat flow from
//! the environment as `ΔT (c1 − c2 ΔT + c3 u) + c4 (EL − σ Tenv⁴) − c6 u G`, the same terms and
//! signs as above if `ΔT = ϑa − ϑm` (its base class's convention, inferred, not read); a published ISO 9806 power-output note
//! evaluates glazed collectors with `u = 3 m/s` and `EL − σ Ta⁴ = −100 W/m²` (the c4 term is a
//! loss under a sky colder than the air); and ISO 9806:2017 test data sheets print the units of
//! the same coefficients, labelled a3 (J/(m³K)), a4 (–), a5 (J/(m²K)) and a6 (s/m).
//!
//! What is modelled here is the steady part: every term except `c5 dϑm/dt`. The collector's
//! effective thermal capacity `c5` is kept in the spec ([`CollectorSpec::c5_j_m2k()`]) for the
//! plant to carry; [`CollectorSpec::outlet_in`] is a steady energy balance.
//!
//! Keys and what they are (a spec given with the steady-state keys alone is the ISO 9806
//! steady-state model: `c3 = c4 = c6 = 0`):
//! * `eta0` – η0,b, the zero-loss efficiency for beam irradiance at normal incidence. A
//!   steady-state test reports η0,hem for the hemispherical irradiance of the test; at near-normal
//!   incidence `η0,hem = η0,b (1 − fd (1 − Kθd))` with `fd` the diffuse fraction during the test
//!   (from memory). That fraction is not on a data sheet, so `eta0` is taken as η0,b
//!   (stated simplification; it overstates the diffuse gain by the factor above, a few % of it).
//! * `a1_w_m2k` – c1, `a2_w_m2k2` – c2 (W/(m²K), W/(m²K²)).
//! * `c3_j_m3k` – c3, wind dependence of the heat loss, J/(m³K) = W·s/(m³K).
//! * `c4` – c4, sky (long-wave) dependence of the heat loss, dimensionless.
//! * `c6_s_m` – c6, wind dependence of the zero-loss efficiency, s/m.
//! * `iam_diffuse` – Kθd, the diffuse IAM.
//! * `c5_j_m2k` or `heat_capacity_kj_m2k` (one of the two; `c5 = 1000 × heat_capacity`).
//!
//! Deviations and limits, stated once:
//! * Below ambient (`tm < ta`) the quadratic term is taken as `c2 |tm − ta| (tm − ta)` so the
//!   heat loss stays monotone in the temperature difference and the outlet equation always
//!   has one root. ISO 9806 tests collectors at `tm ≥ ta`, where both forms are identical.
//! * `u` is the weather's wind speed used as-is (no correction from the weather station's
//!   height to the collector's); ISO 9806 measures it near the collector.
//! * The a7 and a8 terms of ISO 9806:2017 (wind × long-wave, and `(ϑm − ϑa)⁴`) are not modelled.
//! * Concentrating collectors use beam irradiance only; their `iam_diffuse` must be 0
//!   (validation rejects anything else rather than forcing it).
//! * An IAM table is one curve of angle of incidence. For evacuated tubes it is the
//!   transversal curve; the biaxial (transversal × longitudinal) IAM is not modelled.
//!   Their transversal IAM may exceed 1 (tube-to-tube effects), so for evacuated tubes table
//!   values up to 1.5 are accepted; for other kinds `K ≤ 1`.

use crate::error::{Error, Result};
use crate::props::{KELVIN_0C, STEFAN_BOLTZMANN_W_M2K4};
use crate::validate::{in_range, positive};

/// The collector family; decides which irradiance components count and which IAM limits apply.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum CollectorKind {
    /// Glazed flat-plate collector.
    FlatPlate,
    /// Evacuated-tube collector (direct flow or heat pipe).
    EvacuatedTube,
    /// Concentrating collector (parabolic trough, linear Fresnel, ...): beam only.
    Concentrating,
    /// Uncovered (unglazed) collector, e.g. a pool-type absorber: its wind and long-wave
    /// coefficients `c3_j_m3k`, `c4`, `c6_s_m` must be given.
    Uncovered,
}

impl CollectorKind {
    /// Effective thermal capacity (ISO 9806 c5) of the class when a collector gives none,
    /// kJ/(m²·K) on the collector's area basis: flat plate 7, evacuated tube 12, concentrating
    /// (a receiver tube) 5, uncovered (a water-filled absorber mat) 10 (common practice; typical
    /// values of the classes, from memory).
    pub fn default_capacity_kj_m2k(self) -> f64 {
        match self {
            CollectorKind::FlatPlate => 7.0,
            CollectorKind::EvacuatedTube => 12.0,
            CollectorKind::Concentrating => 5.0,
            CollectorKind::Uncovered => 10.0,
        }
    }
}

/// The outdoor conditions the collector sees in one hour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Ambient {
    /// Air temperature ϑa, °C.
    pub t_air_c: f64,
    /// Wind speed u, m/s.
    pub wind_m_s: f64,
    /// Long-wave irradiance EL on the collector, W/m².
    pub long_wave_w_m2: f64,
}

impl Ambient {
    /// Still air and a sky at air temperature (`u = 0`, `EL = σ Ta⁴`): the conditions under
    /// which the quasi-dynamic model is the steady-state model.
    pub fn still(t_air_c: f64) -> Self {
        Ambient {
            t_air_c,
            wind_m_s: 0.0,
            long_wave_w_m2: STEFAN_BOLTZMANN_W_M2K4 * (t_air_c + KELVIN_0C).powi(4),
        }
    }

    /// Net long-wave term `EL − σ Ta⁴`, W/m² (negative under a sky colder than the air).
    pub fn net_long_wave_w_m2(&self) -> f64 {
        self.long_wave_w_m2 - STEFAN_BOLTZMANN_W_M2K4 * (self.t_air_c + KELVIN_0C).powi(4)
    }
}

/// The area the efficiency coefficients are referred to.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum AreaBasis {
    /// Aperture area.
    Aperture,
    /// Gross (outer dimensions) area.
    Gross,
}

/// One collector module with its ISO 9806:2017 coefficients (module docs).
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CollectorSpec {
    /// Collector family.
    pub kind: CollectorKind,
    /// Peak efficiency η0,b for beam irradiance at normal incidence, on `area_basis`.
    pub eta0: f64,
    /// First-order heat loss coefficient a1, W/(m²·K), on `area_basis`.
    pub a1_w_m2k: f64,
    /// Second-order heat loss coefficient a2, W/(m²·K²), on `area_basis`.
    pub a2_w_m2k2: f64,
    /// Area the coefficients refer to.
    pub area_basis: AreaBasis,
    /// Gross area of one module, m².
    pub gross_m2: f64,
    /// Aperture area of one module, m².
    pub aperture_m2: f64,
    /// One-parameter beam IAM coefficient b0 (ASHRAE 93 form `K = 1 − b0 (1/cos θ − 1)`).
    /// Exactly one of `iam_b0` / `iam_table`.
    pub iam_b0: Option<f64>,
    /// Beam IAM table of `[angle_deg, K]` pairs, starting at `[0, 1]`, angles increasing,
    /// linear interpolation; beyond the last angle K falls linearly to 0 at 90°.
    pub iam_table: Option<Vec<[f64; 2]>>,
    /// Diffuse IAM Kd, dimensionless (0 for concentrating collectors).
    pub iam_diffuse: f64,
    /// Effective thermal capacity per m² of `area_basis`, kJ/(m²·K) (for warm-up losses).
    /// The same quantity as `c5_j_m2k` in kJ: give one of the two.
    pub heat_capacity_kj_m2k: Option<f64>,
    /// c5, effective thermal capacity per m² of `area_basis`, J/(m²·K) (ISO 9806:2017
    /// quasi-dynamic model). The same quantity as `heat_capacity_kj_m2k` in J: give one.
    pub c5_j_m2k: Option<f64>,
    /// c3, wind dependence of the heat loss, J/(m³·K) (W·s/(m³·K)); 0 when not given.
    /// Required for an uncovered collector.
    pub c3_j_m3k: Option<f64>,
    /// c4, sky (long-wave) dependence of the heat loss, dimensionless; 0 when not given.
    /// Required for an uncovered collector.
    pub c4: Option<f64>,
    /// c6, wind dependence of the zero-loss efficiency, s/m; 0 when not given. Required for
    /// an uncovered collector.
    pub c6_s_m: Option<f64>,
    /// Stagnation / maximum operating temperature, °C (information).
    pub max_temp_c: Option<f64>,
}

impl CollectorSpec {
    /// Check every coefficient; keys are the field names (`eta0`, `iam_table[2]`, ...),
    /// relative to wherever the spec sits in a scenario (the caller adds the prefix with
    /// [`Error::within`]).
    ///
    /// Allowed: `0 < eta0 ≤ 1`; `0 ≤ a1 ≤ 20` W/(m²K) (`≤ 40` for an uncovered collector,
    /// whose c1 is typically 10–25, common practice) and `0 ≤ a2 ≤ 0.2` W/(m²K²), not both
    /// zero (no loss would mean an unbounded stagnation temperature); `0 < gross_m2 ≤ 1000`,
    /// `0 < aperture_m2 ≤ gross_m2`; exactly one of `iam_b0` (`0..1`) and `iam_table` (at
    /// least two points, first `[0, 1]`, angles strictly increasing within `0..90`, K in
    /// `0..1`, or `0..1.5` for evacuated tubes); `0 ≤ iam_diffuse ≤ 1`, and exactly 0 for
    /// concentrating collectors; at most one of `0 < heat_capacity_kj_m2k ≤ 200` and
    /// `0 < c5_j_m2k ≤ 200000`; `0 ≤ c3_j_m3k ≤ 10`, `0 ≤ c4 ≤ 1`, `0 ≤ c6_s_m ≤ 0.2`, all three
    /// required for an uncovered collector; `50 ≤ max_temp_c ≤ 600`.
    pub fn validate(&self) -> Result<()> {
        positive("eta0", self.eta0, 1.0, "peak efficiency η0,b, fraction")?;
        let a1_max = if self.kind == CollectorKind::Uncovered {
            40.0
        } else {
            20.0
        };
        in_range(
            "a1_w_m2k",
            self.a1_w_m2k,
            0.0,
            a1_max,
            "first-order loss coefficient c1, W/(m²K)",
        )?;
        in_range(
            "a2_w_m2k2",
            self.a2_w_m2k2,
            0.0,
            0.2,
            "second-order loss coefficient, W/(m²K²)",
        )?;
        if self.a1_w_m2k == 0.0 && self.a2_w_m2k2 == 0.0 {
            return Err(Error::input(
                "a1_w_m2k",
                self.a1_w_m2k,
                "a1 and a2 cannot both be zero (a collector without heat loss has no finite stagnation temperature)",
            ));
        }
        positive(
            "gross_m2",
            self.gross_m2,
            1000.0,
            "gross area of one module, m²",
        )?;
        positive(
            "aperture_m2",
            self.aperture_m2,
            self.gross_m2,
            "aperture area of one module, m², at most the gross area",
        )?;
        let k_max = if self.kind == CollectorKind::EvacuatedTube {
            1.5
        } else {
            1.0
        };
        match (&self.iam_b0, &self.iam_table) {
            (Some(b0), None) => {
                in_range(
                    "iam_b0",
                    *b0,
                    0.0,
                    1.0,
                    "one-parameter beam IAM coefficient",
                )?;
            }
            (None, Some(table)) => {
                if table.len() < 2 {
                    return Err(Error::input(
                        "iam_table",
                        format!("a table of {} points", table.len()),
                        "must list at least two [angle_deg, K] points, starting with [0, 1]",
                    ));
                }
                if table[0][0] != 0.0 || (table[0][1] - 1.0).abs() > 1e-9 {
                    return Err(Error::input(
                        "iam_table[0]",
                        format!("[{}, {}]", table[0][0], table[0][1]),
                        "must be [0, 1] (K = 1 at normal incidence)",
                    ));
                }
                for (i, p) in table.iter().enumerate() {
                    let key = format!("iam_table[{i}]");
                    in_range(&key, p[0], 0.0, 90.0, "angle of incidence, degrees")?;
                    in_range(&key, p[1], 0.0, k_max, "beam incidence angle modifier K")?;
                    if i > 0 && p[0] <= table[i - 1][0] {
                        return Err(Error::input(
                            key,
                            p[0],
                            format!(
                                "angles must increase strictly (previous {})",
                                table[i - 1][0]
                            ),
                        ));
                    }
                }
            }
            (Some(_), Some(_)) => {
                return Err(Error::input(
                    "iam_b0",
                    "both iam_b0 and iam_table",
                    "give exactly one of iam_b0 and iam_table",
                ));
            }
            (None, None) => {
                return Err(Error::input(
                    "iam_b0",
                    "neither iam_b0 nor iam_table",
                    "give exactly one of iam_b0 and iam_table",
                ));
            }
        }
        in_range(
            "iam_diffuse",
            self.iam_diffuse,
            0.0,
            1.0,
            "diffuse incidence angle modifier Kd",
        )?;
        if self.kind == CollectorKind::Concentrating && self.iam_diffuse != 0.0 {
            return Err(Error::input(
                "iam_diffuse",
                self.iam_diffuse,
                "must be 0 for a concentrating collector (it collects beam irradiance only)",
            ));
        }
        if let Some(c) = self.heat_capacity_kj_m2k {
            positive(
                "heat_capacity_kj_m2k",
                c,
                200.0,
                "effective thermal capacity, kJ/(m²K)",
            )?;
        }
        if let Some(c) = self.c5_j_m2k {
            if self.heat_capacity_kj_m2k.is_some() {
                return Err(Error::input(
                    "c5_j_m2k",
                    c,
                    "give one of c5_j_m2k (J/(m²K)) and heat_capacity_kj_m2k (kJ/(m²K)): they are the same effective thermal capacity",
                ));
            }
            positive(
                "c5_j_m2k",
                c,
                200_000.0,
                "effective thermal capacity c5, J/(m²K)",
            )?;
        }
        let quasi = [
            (
                "c3_j_m3k",
                self.c3_j_m3k,
                10.0,
                "wind dependence of the heat loss c3, J/(m³K)",
            ),
            (
                "c4",
                self.c4,
                1.0,
                "sky (long-wave) dependence of the heat loss c4, dimensionless",
            ),
            (
                "c6_s_m",
                self.c6_s_m,
                0.2,
                "wind dependence of the zero-loss efficiency c6, s/m",
            ),
        ];
        for (key, value, max, what) in quasi {
            match value {
                Some(v) => in_range(key, v, 0.0, max, what)?,
                None if self.kind == CollectorKind::Uncovered => {
                    return Err(Error::input(
                        key,
                        "(missing)",
                        format!(
                            "kind = \"uncovered\" needs its wind and long-wave coefficients c3_j_m3k, c4 and c6_s_m (ISO 9806:2017 quasi-dynamic model); {what}, 0 to {max}"
                        ),
                    ));
                }
                None => {}
            }
        }
        if let Some(t) = self.max_temp_c {
            in_range(
                "max_temp_c",
                t,
                50.0,
                600.0,
                "stagnation / maximum temperature, °C",
            )?;
        }
        Ok(())
    }

    /// Incidence angle modifier for beam irradiance, dimensionless.
    ///
    /// * With `iam_b0`: one-parameter form `K = 1 − b0 (1/cos θ − 1)`, clipped to `[0, 1]`.
    ///   (D&B write it `1 + b0 (1/cos θ − 1)` with `b0 < 0`; here `b0 > 0`.)
    /// * With `iam_table`: linear interpolation between the listed points; beyond the last
    ///   listed angle, linear from its K to 0 at 90°.
    ///
    /// * `theta_deg` – angle of incidence on the aperture, degrees (its magnitude is used)
    ///
    /// Returns 0 for θ ≥ 90° (sun behind the aperture) and for a NaN angle. Does not
    /// allocate.
    ///
    /// Source: ANSI/ASHRAE 93; Duffie & Beckman, *Solar Engineering of Thermal Processes*,
    /// 4th ed., Wiley 2013, §6.17; ISO 9806:2017 (tabulated IAM).
    pub fn iam_beam(&self, theta_deg: f64) -> f64 {
        let theta = theta_deg.abs();
        if theta.is_nan() || theta >= 90.0 {
            return 0.0;
        }
        if let Some(table) = &self.iam_table {
            return interp_iam(table, theta);
        }
        let b0 = self.iam_b0.unwrap_or(0.0);
        (1.0 - b0 * (1.0 / theta.to_radians().cos() - 1.0)).clamp(0.0, 1.0)
    }

    /// Efficiency at a reduced temperature difference, normal incidence, all of `G` counted
    /// with η0 (ISO 9806:2017 steady-state efficiency curve):
    ///
    /// `η = η0 − a1 (tm − ta)/G − a2 (tm − ta)²/G`
    ///
    /// * `tm_c` – mean fluid temperature, °C; `ta_c` – ambient air temperature, °C
    /// * `g_w_m2` – irradiance in the collector plane, W/m²
    ///
    /// Returns the fraction of `G` delivered (negative when losses exceed the gain). For
    /// `G ≤ 0` (or NaN) the efficiency is undefined and 0 is returned. Below ambient the
    /// quadratic term is `a2 |Δ| Δ` (see module notes).
    ///
    /// Source: ISO 9806:2017, steady-state model.
    pub fn efficiency(&self, tm_c: f64, ta_c: f64, g_w_m2: f64) -> f64 {
        if g_w_m2.is_nan() || g_w_m2 <= 0.0 {
            return 0.0;
        }
        self.eta0 - self.loss_w_m2(tm_c - ta_c, &Ambient::still(ta_c)) / g_w_m2
    }

    /// Useful power per m² of the area basis, W/m², at mean fluid temperature `tm_c`, in still
    /// air under a sky at air temperature (the ISO 9806:2017 steady-state model):
    ///
    /// `q = η0 (Kb(θ) Gb + Kd Gd) − a1 (tm − ta) − a2 (tm − ta)²`
    ///
    /// * `g_beam_w_m2`, `g_diffuse_w_m2` – beam and diffuse (sky + ground) irradiance in the
    ///   collector plane, W/m² (negative values count as 0)
    /// * `aoi_deg` – angle of incidence of the beam, degrees
    /// * `tm_c`, `ta_c` – mean fluid and ambient temperatures, °C
    ///
    /// [`Self::useful_in`] with [`Ambient::still`]. Source: ISO 9806:2017, steady-state model;
    /// IAM per Duffie & Beckman 4th ed. §6.17.
    pub fn useful_w_m2(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        tm_c: f64,
        ta_c: f64,
    ) -> f64 {
        self.useful_in(
            g_beam_w_m2,
            g_diffuse_w_m2,
            aoi_deg,
            tm_c,
            &Ambient::still(ta_c),
        )
    }

    /// Useful power per m² of the area basis, W/m², at mean fluid temperature `tm_c` (the
    /// steady part of the ISO 9806:2017 quasi-dynamic model, module docs):
    ///
    /// `q = η0,b (Kb(θ) Gb + Kd Gd) − c6 u G + c4 (EL − σ Ta⁴) − (c1 + c3 u) Δ − c2 |Δ| Δ`,
    /// `Δ = tm − ta`, `G = Gb + Gd`
    ///
    /// * irradiance and angle as in [`Self::useful_w_m2`]
    /// * `amb` – air temperature, wind speed (negative counts as 0) and long-wave irradiance
    ///
    /// Can be negative (net loss): the caller decides whether to run. Concentrating
    /// collectors ignore the diffuse term of the optical gain.
    ///
    /// Source: ISO 9806:2017, quasi-dynamic collector model without the c5 term.
    pub fn useful_in(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        tm_c: f64,
        amb: &Ambient,
    ) -> f64 {
        self.source_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, amb)
            - self.loss_w_m2(tm_c - amb.t_air_c, amb)
    }

    /// Outlet temperature and useful power for a steady flow, still air and a sky at air
    /// temperature: [`Self::outlet_in`] with [`Ambient::still`]`(ta_c)`.
    #[allow(clippy::too_many_arguments)]
    pub fn outlet(
        &self,
        t_in_c: f64,
        flow_kg_s_m2: f64,
        cp_j_kgk: f64,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        ta_c: f64,
    ) -> (f64, f64) {
        self.outlet_in(
            t_in_c,
            flow_kg_s_m2,
            cp_j_kgk,
            g_beam_w_m2,
            g_diffuse_w_m2,
            aoi_deg,
            &Ambient::still(ta_c),
        )
    }

    /// Outlet temperature and useful power for a steady flow through the collector.
    ///
    /// Solves `ṁ cp (t_out − t_in) = q(tm)` with `tm = (t_in + t_out)/2` exactly. The terms
    /// that do not depend on `tm` (optical gain, the c6 and c4 terms) make
    /// `S = η0,b (Kb Gb + Kd Gd) − c6 u G + c4 (EL − σ Ta⁴)`; the loss is linear in
    /// `x = tm − ta` with `c1 + c3 u` and quadratic with c2. With `m = ṁ cp` (W/(m²K)):
    /// `c2 x|x| + (c1 + c3 u + 2m) x − (S + 2m (t_in − ta)) = 0`, whose single root is
    /// `x = 2c / (b + √(b² + 4 c2 |c|))`, `b = c1 + c3 u + 2m`, `c = S + 2m (t_in − ta)`
    /// (the cancellation-free form of the quadratic formula). Then `t_out = 2 tm − t_in`.
    ///
    /// * `t_in_c` – inlet temperature, °C
    /// * `flow_kg_s_m2` – mass flow per m² of the area basis, kg/(s·m²)
    /// * `cp_j_kgk` – fluid specific heat, J/(kg·K)
    /// * irradiance, angle and `amb` as in [`Self::useful_in`]
    ///
    /// Returns `(t_out_c, q_w_m2)` with `q_w_m2 = ṁ cp (t_out − t_in)` per m² of the area
    /// basis (negative when the fluid loses heat). Zero or negative flow: no stream, so
    /// `q = 0` and `t_out` is the no-flow (stagnation) mean temperature of
    /// [`Self::stagnation_in`]. The spec must have been validated.
    ///
    /// Source: ISO 9806:2017 quasi-dynamic model without the c5 term; the mean-temperature
    /// energy balance as in Duffie & Beckman 4th ed. §6.19–6.20 (conversion of `tm`-based test
    /// results).
    #[allow(clippy::too_many_arguments)]
    pub fn outlet_in(
        &self,
        t_in_c: f64,
        flow_kg_s_m2: f64,
        cp_j_kgk: f64,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        amb: &Ambient,
    ) -> (f64, f64) {
        let s = self.source_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, amb);
        let m = flow_kg_s_m2 * cp_j_kgk;
        let ta_c = amb.t_air_c;
        if m.is_nan() || m <= 0.0 {
            return (ta_c + self.stagnation_delta_k(s, amb), 0.0);
        }
        let b = self.linear_loss_w_m2k(amb) + 2.0 * m;
        let c = s + 2.0 * m * (t_in_c - ta_c);
        let x = 2.0 * c / (b + (b * b + 4.0 * self.a2_w_m2k2 * c.abs()).sqrt());
        let t_out = 2.0 * (ta_c + x) - t_in_c;
        (t_out, m * (t_out - t_in_c))
    }

    /// No-flow (stagnation) mean temperature, °C, in still air under a sky at air temperature:
    /// [`Self::stagnation_in`] with [`Ambient::still`]`(ta_c)`.
    pub fn stagnation_c(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        ta_c: f64,
    ) -> f64 {
        self.stagnation_in(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, &Ambient::still(ta_c))
    }

    /// No-flow (stagnation) mean temperature, °C: the `tm` at which the useful power of
    /// [`Self::useful_in`] is zero, root of `S = (c1 + c3 u) Δ + c2 |Δ| Δ`,
    /// `Δ = 2S / (c1 + c3 u + √((c1 + c3 u)² + 4 c2 |S|))` (S as in [`Self::outlet_in`]).
    ///
    /// * arguments as in [`Self::useful_in`]
    ///
    /// Returns `ta` at zero irradiance under a sky at air temperature; below `ta` under a
    /// colder sky when `c4 > 0`. A steady-state estimate with the collector's test
    /// coefficients (extrapolated when Δ is far above the tested range); it is not capped at
    /// `max_temp_c`. The spec must have been validated (a1 and a2 not both zero).
    ///
    /// Source: ISO 9806:2017 quasi-dynamic model without the c5 term, set to q = 0.
    pub fn stagnation_in(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        amb: &Ambient,
    ) -> f64 {
        amb.t_air_c
            + self.stagnation_delta_k(
                self.source_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg, amb),
                amb,
            )
    }

    /// Effective thermal capacity c5 per m² of the area basis, J/(m²K), from whichever of
    /// `c5_j_m2k` and `heat_capacity_kj_m2k` (× 1000) was given; `None` if neither.
    pub fn c5_j_m2k(&self) -> Option<f64> {
        self.c5_j_m2k
            .or(self.heat_capacity_kj_m2k.map(|c| c * 1000.0))
    }

    /// Area of one module on the area basis of the coefficients, m².
    pub fn area_m2(&self) -> f64 {
        match self.area_basis {
            AreaBasis::Aperture => self.aperture_m2,
            AreaBasis::Gross => self.gross_m2,
        }
    }

    /// Optical gain `η0,b (Kb Gb + Kd Gd)` per m², W/m².
    fn absorbed_w_m2(&self, g_beam_w_m2: f64, g_diffuse_w_m2: f64, aoi_deg: f64) -> f64 {
        let gb = g_beam_w_m2.max(0.0);
        let gd = if self.kind == CollectorKind::Concentrating {
            0.0
        } else {
            g_diffuse_w_m2.max(0.0)
        };
        self.eta0 * (self.iam_beam(aoi_deg) * gb + self.iam_diffuse * gd)
    }

    /// The terms independent of the mean temperature, W/m²:
    /// `S = η0,b (Kb Gb + Kd Gd) − c6 u G + c4 (EL − σ Ta⁴)`, `G = Gb + Gd`.
    fn source_w_m2(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        amb: &Ambient,
    ) -> f64 {
        let g = g_beam_w_m2.max(0.0) + g_diffuse_w_m2.max(0.0);
        self.absorbed_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg)
            - self.c6_s_m.unwrap_or(0.0) * wind(amb) * g
            + self.c4.unwrap_or(0.0) * amb.net_long_wave_w_m2()
    }

    /// Linear loss coefficient `c1 + c3 u`, W/(m²K).
    pub(crate) fn linear_loss_w_m2k(&self, amb: &Ambient) -> f64 {
        self.a1_w_m2k + self.c3_j_m3k.unwrap_or(0.0) * wind(amb)
    }

    /// Heat loss per m², W/m², at `dt = tm − ta`: `(c1 + c3 u) Δ + c2 |Δ| Δ`.
    fn loss_w_m2(&self, dt_k: f64, amb: &Ambient) -> f64 {
        self.linear_loss_w_m2k(amb) * dt_k + self.a2_w_m2k2 * dt_k.abs() * dt_k
    }

    /// Δ at which the loss equals `s`, K.
    fn stagnation_delta_k(&self, s_w_m2: f64, amb: &Ambient) -> f64 {
        let a1 = self.linear_loss_w_m2k(amb);
        let den = a1 + (a1 * a1 + 4.0 * self.a2_w_m2k2 * s_w_m2.abs()).sqrt();
        if den > 0.0 { 2.0 * s_w_m2 / den } else { 0.0 }
    }
}

/// Wind speed counted by the model, m/s: negative or NaN counts as 0.
fn wind(amb: &Ambient) -> f64 {
    amb.wind_m_s.max(0.0)
}

/// Linear interpolation in an IAM table starting at angle 0; beyond the last point, linear
/// to K = 0 at 90°. `theta` in `[0, 90)`.
fn interp_iam(table: &[[f64; 2]], theta: f64) -> f64 {
    let mut prev = match table.first() {
        Some(p) => *p,
        None => return 0.0,
    };
    if theta <= prev[0] {
        return prev[1];
    }
    for p in &table[1..] {
        if theta <= p[0] {
            return lerp(prev, *p, theta);
        }
        prev = *p;
    }
    if prev[0] >= 90.0 {
        return 0.0;
    }
    lerp(prev, [90.0, 0.0], theta)
}

fn lerp(a: [f64; 2], b: [f64; 2], x: f64) -> f64 {
    if b[0] > a[0] {
        a[1] + (b[1] - a[1]) * (x - a[0]) / (b[0] - a[0])
    } else {
        b[1]
    }
}

/// Typical glazed flat-plate collector (typical of the class, not a real product):
/// η0 = 0.78, a1 = 3.6 W/(m²K), a2 = 0.014 W/(m²K²), b0 = 0.12, Kd = 0.90, on aperture.
#[cfg(test)]
pub(crate) fn demo_flat_plate() -> CollectorSpec {
    CollectorSpec {
        kind: CollectorKind::FlatPlate,
        eta0: 0.78,
        a1_w_m2k: 3.6,
        a2_w_m2k2: 0.014,
        area_basis: AreaBasis::Aperture,
        gross_m2: 2.5,
        aperture_m2: 2.3,
        iam_b0: Some(0.12),
        iam_table: None,
        iam_diffuse: 0.90,
        heat_capacity_kj_m2k: Some(7.0),
        c5_j_m2k: None,
        c3_j_m3k: None,
        c4: None,
        c6_s_m: None,
        max_temp_c: Some(200.0),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Typical evacuated-tube collector (typical of the class) with a transversal IAM table.
    fn demo_tube() -> CollectorSpec {
        CollectorSpec {
            kind: CollectorKind::EvacuatedTube,
            eta0: 0.64,
            a1_w_m2k: 1.1,
            a2_w_m2k2: 0.006,
            area_basis: AreaBasis::Gross,
            gross_m2: 3.0,
            aperture_m2: 2.8,
            iam_b0: None,
            iam_table: Some(vec![[0.0, 1.0], [30.0, 1.02], [50.0, 1.10], [70.0, 0.9]]),
            iam_diffuse: 0.95,
            heat_capacity_kj_m2k: None,
            c5_j_m2k: None,
            c3_j_m3k: None,
            c4: None,
            c6_s_m: None,
            max_temp_c: None,
        }
    }

    #[test]
    fn demo_specs_validate() {
        demo_flat_plate().validate().unwrap();
        demo_tube().validate().unwrap();
    }

    /// IAM = 1 at normal incidence, 0 at and beyond 90°, and the b0 form at 60°:
    /// K = 1 − 0.12 (1/0.5 − 1) = 0.88 (ASHRAE 93 form, D&B 4th ed. §6.17).
    #[test]
    fn iam_limits_and_value() {
        let c = demo_flat_plate();
        assert_eq!(c.iam_beam(0.0), 1.0);
        assert_eq!(c.iam_beam(90.0), 0.0);
        assert_eq!(c.iam_beam(120.0), 0.0);
        assert_eq!(c.iam_beam(f64::NAN), 0.0);
        assert!((c.iam_beam(60.0) - 0.88).abs() < 1e-12);
        let t = demo_tube();
        assert_eq!(t.iam_beam(0.0), 1.0);
        assert_eq!(t.iam_beam(90.0), 0.0);
        // between 30° (1.02) and 50° (1.10): at 40°, 1.06
        assert!((t.iam_beam(40.0) - 1.06).abs() < 1e-12);
        // beyond the last point (70°, 0.9): linear to 0 at 90°, so 0.45 at 80°
        assert!((t.iam_beam(80.0) - 0.45).abs() < 1e-12);
    }

    /// The one-parameter IAM never increases with the angle (it is 1 − b0 (sec θ − 1), b0 > 0).
    #[test]
    fn iam_b0_monotone() {
        let c = demo_flat_plate();
        let mut last = c.iam_beam(0.0);
        for i in 1..=95 {
            let k = c.iam_beam(i as f64);
            assert!(k <= last && k >= 0.0, "θ = {i}: {k} > {last}");
            last = k;
        }
        // cut-off where 1 − b0 (1/cos θ − 1) = 0: cos θ = b0/(1 + b0) → θ = 83.85°
        assert!(c.iam_beam(83.8) > 0.0);
        assert_eq!(c.iam_beam(83.9), 0.0);
    }

    /// At tm = ta the gain is η0 (Kb Gb + Kd Gd): 0.78 (0.88·600 + 0.9·200) = 552.24 W/m².
    #[test]
    fn useful_at_ambient_is_optical_gain() {
        let c = demo_flat_plate();
        let q = c.useful_w_m2(600.0, 200.0, 60.0, 25.0, 25.0);
        assert!((q - 552.24).abs() < 1e-9, "{q}");
        // concentrating: diffuse ignored
        let mut p = demo_flat_plate();
        p.kind = CollectorKind::Concentrating;
        p.iam_diffuse = 0.0;
        assert!((p.useful_w_m2(600.0, 200.0, 60.0, 25.0, 25.0) - 0.78 * 0.88 * 600.0).abs() < 1e-9);
    }

    /// ISO 9806 curve by hand: η = 0.78 − 3.6·0.05 − 0.014·0.05²·1000 = 0.565 at
    /// (tm − ta)/G = 0.05 m²K/W with G = 1000 W/m².
    #[test]
    fn efficiency_by_hand() {
        let c = demo_flat_plate();
        assert!((c.efficiency(70.0, 20.0, 1000.0) - 0.565).abs() < 1e-12);
        assert_eq!(c.efficiency(70.0, 20.0, 0.0), 0.0);
    }

    /// Energy balance of the outlet solution: ṁ cp ΔT = q(tm) to 1e-9 W/m², above and below
    /// ambient, with and without sun.
    #[test]
    fn outlet_energy_balance() {
        let c = demo_flat_plate();
        for &(tin, gb, gd) in &[
            (40.0, 700.0, 150.0),
            (90.0, 0.0, 0.0),
            (5.0, 0.0, 50.0),
            (60.0, 300.0, 100.0),
        ] {
            let (tout, q) = c.outlet(tin, 0.015, 4180.0, gb, gd, 30.0, 20.0);
            let tm = 0.5 * (tin + tout);
            let q_model = c.useful_w_m2(gb, gd, 30.0, tm, 20.0);
            assert!((q - q_model).abs() < 1e-9, "tin {tin}: {q} vs {q_model}");
            assert!((q - 0.015 * 4180.0 * (tout - tin)).abs() < 1e-9);
        }
    }

    /// Zero flow and zero irradiance give finite numbers: zero flow → q = 0 and t_out the
    /// stagnation temperature; no sun at ambient inlet → t_out = t_in = ta.
    #[test]
    fn zero_flow_and_no_sun_are_finite() {
        let c = demo_flat_plate();
        let (t, q) = c.outlet(50.0, 0.0, 4180.0, 800.0, 100.0, 20.0, 25.0);
        assert_eq!(q, 0.0);
        assert!((t - c.stagnation_c(800.0, 100.0, 20.0, 25.0)).abs() < 1e-12);
        assert!(t > 100.0 && t < 250.0, "stagnation {t}");
        let (t, q) = c.outlet(25.0, 0.02, 4180.0, 0.0, 0.0, 0.0, 25.0);
        assert!(t.is_finite() && (t - 25.0).abs() < 1e-12 && q.abs() < 1e-9);
        let (t, q) = c.outlet(25.0, 0.0, 4180.0, 0.0, 0.0, 95.0, 25.0);
        assert!((t - 25.0).abs() < 1e-12 && q == 0.0);
        assert_eq!(c.stagnation_c(0.0, 0.0, 0.0, 12.0), 12.0);
    }

    #[test]
    fn validate_names_the_key() {
        let mut c = demo_flat_plate();
        c.eta0 = 1.2;
        assert!(c.validate().unwrap_err().to_string().contains("eta0"));
        let mut c = demo_flat_plate();
        c.iam_table = Some(vec![[0.0, 1.0], [40.0, 0.9]]);
        assert!(
            c.validate()
                .unwrap_err()
                .to_string()
                .contains("exactly one")
        );
        let mut c = demo_tube();
        c.iam_table = Some(vec![[0.0, 1.0], [40.0, 0.9], [30.0, 0.8]]);
        assert!(
            c.validate()
                .unwrap_err()
                .to_string()
                .contains("iam_table[2]")
        );
        let mut c = demo_flat_plate();
        c.kind = CollectorKind::Concentrating;
        assert!(
            c.validate()
                .unwrap_err()
                .to_string()
                .contains("iam_diffuse")
        );
        let mut c = demo_flat_plate();
        c.a1_w_m2k = 0.0;
        c.a2_w_m2k2 = 0.0;
        assert!(c.validate().unwrap_err().to_string().contains("a1_w_m2k"));
        let mut c = demo_flat_plate();
        c.aperture_m2 = 3.0;
        assert!(
            c.validate()
                .unwrap_err()
                .to_string()
                .contains("aperture_m2")
        );
    }

    /// Typical uncovered (pool-type) absorber, typical of the class (invented, not a real
    /// product; common practice orders of magnitude): η0,b 0.85, c1 = 12 W/(m²K), c3 = 3
    /// J/(m³K), c4 = 0.5, c6 = 0.04 s/m.
    fn demo_uncovered() -> CollectorSpec {
        CollectorSpec {
            kind: CollectorKind::Uncovered,
            eta0: 0.85,
            a1_w_m2k: 12.0,
            a2_w_m2k2: 0.0,
            area_basis: AreaBasis::Gross,
            gross_m2: 5.0,
            aperture_m2: 5.0,
            iam_b0: Some(0.1),
            iam_table: None,
            iam_diffuse: 0.95,
            heat_capacity_kj_m2k: None,
            c5_j_m2k: Some(12_000.0),
            c3_j_m3k: Some(3.0),
            c4: Some(0.5),
            c6_s_m: Some(0.04),
            max_temp_c: None,
        }
    }

    /// The steady-state model as it was written before the quasi-dynamic terms (ISO 9806:2017
    /// steady-state model): `q = η0 (Kb Gb + Kd Gd) − a1 Δ − a2 |Δ| Δ`, and its exact outlet.
    fn steady_useful(c: &CollectorSpec, gb: f64, gd: f64, aoi: f64, tm: f64, ta: f64) -> f64 {
        let gd = if c.kind == CollectorKind::Concentrating {
            0.0
        } else {
            gd.max(0.0)
        };
        let s = c.eta0 * (c.iam_beam(aoi) * gb.max(0.0) + c.iam_diffuse * gd);
        let dt = tm - ta;
        s - (c.a1_w_m2k * dt + c.a2_w_m2k2 * dt.abs() * dt)
    }

    proptest::proptest! {
        /// With c3 = c4 = c6 = 0 and the sky at air temperature the quasi-dynamic model is the
        /// steady-state model, bit for bit, at any wind speed (useful power, outlet, no-flow
        /// temperature); and with any c3, c4, c6 in still air under a sky at air temperature.
        #[test]
        fn quasi_dynamic_reduces_to_steady_state(
            gb in 0.0..1100.0f64, gd in 0.0..500.0f64, aoi in 0.0..95.0f64,
            tm in -10.0..200.0f64, ta in -20.0..45.0f64, u in 0.0..15.0f64,
            t_in in 0.0..150.0f64, flow in 0.001..0.05f64,
            c3 in 0.0..10.0f64, c4 in 0.0..1.0f64, c6 in 0.0..0.2f64,
        ) {
            let c = demo_flat_plate();
            let windy = Ambient { wind_m_s: u, ..Ambient::still(ta) };
            let q0 = steady_useful(&c, gb, gd, aoi, tm, ta);
            proptest::prop_assert_eq!(c.useful_in(gb, gd, aoi, tm, &windy), q0);
            proptest::prop_assert_eq!(c.useful_w_m2(gb, gd, aoi, tm, ta), q0);
            proptest::prop_assert_eq!(
                c.outlet_in(t_in, flow, 4180.0, gb, gd, aoi, &windy),
                c.outlet(t_in, flow, 4180.0, gb, gd, aoi, ta)
            );
            proptest::prop_assert_eq!(
                c.stagnation_in(gb, gd, aoi, &windy),
                c.stagnation_c(gb, gd, aoi, ta)
            );
            let mut q = c.clone();
            q.c3_j_m3k = Some(c3);
            q.c4 = Some(c4);
            q.c6_s_m = Some(c6);
            let still = Ambient::still(ta);
            proptest::prop_assert_eq!(q.useful_in(gb, gd, aoi, tm, &still), q0);
            proptest::prop_assert_eq!(
                q.outlet_in(t_in, flow, 4180.0, gb, gd, aoi, &still),
                c.outlet(t_in, flow, 4180.0, gb, gd, aoi, ta)
            );
            // the outlet balances the quasi-dynamic q at the mean temperature, in wind under a
            // cold sky too
            let sky = Ambient { wind_m_s: u, long_wave_w_m2: 0.8 * still.long_wave_w_m2, ..still };
            let (t_out, qo) = q.outlet_in(t_in, flow, 4180.0, gb, gd, aoi, &sky);
            let q_model = q.useful_in(gb, gd, aoi, 0.5 * (t_in + t_out), &sky);
            proptest::prop_assert!((qo - q_model).abs() < 1e-9 * (1.0 + q_model.abs()));
        }
    }

    /// An uncovered collector loses more at 5 m/s than at 1 m/s (ISO 9806:2017 c3 and c6
    /// terms), at the same mean temperature above ambient and the same sun; by hand at
    /// Gb = 600, Gd = 100 W/m² at normal incidence, Δ = 10 K, sky at air temperature:
    /// `Δq = −(c6 G + c3 Δ)(5 − 1) = −(0.04·700 + 3·10)·4 = −232 W/m²`.
    #[test]
    fn uncovered_loses_more_in_wind() {
        let c = demo_uncovered();
        c.validate().unwrap();
        let at = |u: f64| {
            let amb = Ambient {
                wind_m_s: u,
                ..Ambient::still(25.0)
            };
            c.useful_in(600.0, 100.0, 0.0, 35.0, &amb)
        };
        assert!(at(5.0) < at(1.0));
        assert!(
            (at(5.0) - at(1.0) + 232.0).abs() < 1e-9,
            "{}",
            at(5.0) - at(1.0)
        );
        // and the outlet delivers less, the no-flow temperature is lower
        let o = |u: f64| {
            let amb = Ambient {
                wind_m_s: u,
                ..Ambient::still(25.0)
            };
            (
                c.outlet_in(30.0, 0.02, 4180.0, 600.0, 100.0, 0.0, &amb).1,
                c.stagnation_in(600.0, 100.0, 0.0, &amb),
            )
        };
        assert!(o(5.0).0 < o(1.0).0 && o(5.0).1 < o(1.0).1);
        // a night sky colder than the air cools the absorber below ambient (c4 > 0)
        let night = Ambient {
            wind_m_s: 1.0,
            long_wave_w_m2: 300.0,
            t_air_c: 15.0,
        };
        assert!(c.stagnation_in(0.0, 0.0, 0.0, &night) < 15.0);
    }

    #[test]
    fn uncovered_needs_its_coefficients() {
        demo_uncovered().validate().unwrap();
        for key in ["c3_j_m3k", "c4", "c6_s_m"] {
            let mut c = demo_uncovered();
            match key {
                "c3_j_m3k" => c.c3_j_m3k = None,
                "c4" => c.c4 = None,
                _ => c.c6_s_m = None,
            }
            let e = c.validate().unwrap_err().to_string();
            assert!(e.contains(key) && e.contains("uncovered"), "{e}");
        }
        let mut c = demo_uncovered();
        c.c4 = Some(1.5);
        assert!(c.validate().unwrap_err().to_string().contains("c4"));
        // c5 and heat_capacity are one quantity: one of the two
        let mut c = demo_uncovered();
        c.heat_capacity_kj_m2k = Some(12.0);
        assert!(c.validate().unwrap_err().to_string().contains("c5_j_m2k"));
        assert_eq!(demo_uncovered().c5_j_m2k(), Some(12_000.0));
        assert_eq!(demo_flat_plate().c5_j_m2k(), Some(7000.0));
    }

    /// `Ambient::still` is a black sky at air temperature: EL = σ Ta⁴ = 5.670374419e-8 ·
    /// 293.15⁴ = 418.77 W/m² at 20 °C, and the net long-wave term is 0.
    #[test]
    fn still_ambient() {
        let a = Ambient::still(20.0);
        assert!(
            (a.long_wave_w_m2 - 418.77).abs() < 0.01,
            "{}",
            a.long_wave_w_m2
        );
        assert_eq!(a.net_long_wave_w_m2(), 0.0);
    }

    #[test]
    fn deserializes_from_toml() {
        let c: CollectorSpec = toml::from_str(
            r#"kind = "evacuated-tube"
eta0 = 0.6
a1_w_m2k = 1.2
a2_w_m2k2 = 0.005
area_basis = "gross"
gross_m2 = 2.0
aperture_m2 = 1.8
iam_table = [[0, 1], [50, 1.05], [80, 0.6]]
iam_diffuse = 0.9
"#,
        )
        .unwrap();
        assert_eq!(c.kind, CollectorKind::EvacuatedTube);
        assert_eq!(c.c3_j_m3k, None);
        assert_eq!(c.area_m2(), 2.0);
        c.validate().unwrap();
    }
}
