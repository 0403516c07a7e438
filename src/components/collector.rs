//! Solar thermal collector: the ISO 9806:2017 steady-state efficiency model with a beam
//! incidence angle modifier (IAM) and a diffuse IAM.
//!
//! Useful power per m² of the area basis (aperture or gross, whichever the coefficients were
//! measured on), at mean fluid temperature `tm`:
//!
//! `q = η0,b · (Kb(θ) · Gb + Kd · Gd) − a1 (tm − ta) − a2 (tm − ta)²`
//!
//! Source: ISO 9806:2017, *Solar energy — Solar thermal collectors — Test methods*, the
//! steady-state model (quasi-dynamic terms for wind, sky radiation and thermal capacity
//! dropped). `η0` here is the peak efficiency for beam irradiance at normal incidence
//! (η0,b in ISO 9806:2017); diffuse irradiance enters through `Kd`.
//!
//! Deviations and limits, stated once:
//! * Below ambient (`tm < ta`) the quadratic term is taken as `a2 |tm − ta| (tm − ta)` so the
//!   heat loss stays monotone in the temperature difference and the outlet equation always
//!   has one root. ISO 9806 tests collectors at `tm ≥ ta`, where both forms are identical.
//! * Concentrating collectors use beam irradiance only; their `iam_diffuse` must be 0
//!   (validation rejects anything else rather than forcing it).
//! * An IAM table is one curve of angle of incidence. For evacuated tubes it is the
//!   transversal curve; the biaxial (transversal × longitudinal) IAM is not modelled.
//!   Their transversal IAM may exceed 1 (tube-to-tube effects), so for evacuated tubes table
//!   values up to 1.5 are accepted; for other kinds `K ≤ 1`.

use crate::error::{Error, Result};
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

/// One collector module with its ISO 9806:2017 steady-state coefficients.
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
    pub heat_capacity_kj_m2k: Option<f64>,
    /// Stagnation / maximum operating temperature, °C (information).
    pub max_temp_c: Option<f64>,
}

impl CollectorSpec {
    /// Check every coefficient; keys are the field names (`eta0`, `iam_table[2]`, ...),
    /// relative to wherever the spec sits in a scenario (the caller adds the prefix with
    /// [`Error::within`]).
    ///
    /// Allowed: `0 < eta0 ≤ 1`; `0 ≤ a1 ≤ 20` W/(m²K) and `0 ≤ a2 ≤ 0.2` W/(m²K²), not both
    /// zero (no loss would mean an unbounded stagnation temperature); `0 < gross_m2 ≤ 1000`,
    /// `0 < aperture_m2 ≤ gross_m2`; exactly one of `iam_b0` (`0..1`) and `iam_table` (at
    /// least two points, first `[0, 1]`, angles strictly increasing within `0..90`, K in
    /// `0..1`, or `0..1.5` for evacuated tubes); `0 ≤ iam_diffuse ≤ 1`, and exactly 0 for
    /// concentrating collectors; `0 < heat_capacity_kj_m2k ≤ 200`; `50 ≤ max_temp_c ≤ 600`.
    pub fn validate(&self) -> Result<()> {
        positive("eta0", self.eta0, 1.0, "peak efficiency η0,b, fraction")?;
        in_range(
            "a1_w_m2k",
            self.a1_w_m2k,
            0.0,
            20.0,
            "first-order loss coefficient, W/(m²K)",
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
        self.eta0 - self.loss_w_m2(tm_c - ta_c) / g_w_m2
    }

    /// Useful power per m² of the area basis, W/m², at mean fluid temperature `tm_c`:
    ///
    /// `q = η0 (Kb(θ) Gb + Kd Gd) − a1 (tm − ta) − a2 (tm − ta)²`
    ///
    /// * `g_beam_w_m2`, `g_diffuse_w_m2` – beam and diffuse (sky + ground) irradiance in the
    ///   collector plane, W/m² (negative values count as 0)
    /// * `aoi_deg` – angle of incidence of the beam, degrees
    /// * `tm_c`, `ta_c` – mean fluid and ambient temperatures, °C
    ///
    /// Can be negative (net loss): the caller decides whether to run. Concentrating
    /// collectors ignore the diffuse term.
    ///
    /// Source: ISO 9806:2017, steady-state model; IAM per Duffie & Beckman 4th ed. §6.17.
    pub fn useful_w_m2(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        tm_c: f64,
        ta_c: f64,
    ) -> f64 {
        self.absorbed_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg) - self.loss_w_m2(tm_c - ta_c)
    }

    /// Outlet temperature and useful power for a steady flow through the collector.
    ///
    /// Solves `ṁ cp (t_out − t_in) = q(tm)` with `tm = (t_in + t_out)/2` exactly. With
    /// `x = tm − ta`, `m = ṁ cp` (W/(m²K)), `S = η0 (Kb Gb + Kd Gd)`:
    /// `a2 x|x| + (a1 + 2m) x − (S + 2m (t_in − ta)) = 0`, whose single root is
    /// `x = 2c / (b + √(b² + 4 a2 |c|))`, `b = a1 + 2m`, `c = S + 2m (t_in − ta)`
    /// (the cancellation-free form of the quadratic formula). Then `t_out = 2 tm − t_in`.
    ///
    /// * `t_in_c` – inlet temperature, °C
    /// * `flow_kg_s_m2` – mass flow per m² of the area basis, kg/(s·m²)
    /// * `cp_j_kgk` – fluid specific heat, J/(kg·K)
    /// * irradiance, angle and ambient as in [`Self::useful_w_m2`]
    ///
    /// Returns `(t_out_c, q_w_m2)` with `q_w_m2 = ṁ cp (t_out − t_in)` per m² of the area
    /// basis (negative when the fluid loses heat). Zero or negative flow: no stream, so
    /// `q = 0` and `t_out` is the no-flow (stagnation) mean temperature of
    /// [`Self::stagnation_c`]. The spec must have been validated.
    ///
    /// Source: ISO 9806:2017 steady-state model; the mean-temperature energy balance as in
    /// Duffie & Beckman 4th ed. §6.19–6.20 (conversion of `tm`-based test results).
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
        let s = self.absorbed_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg);
        let m = flow_kg_s_m2 * cp_j_kgk;
        if m.is_nan() || m <= 0.0 {
            return (ta_c + self.stagnation_delta_k(s), 0.0);
        }
        let b = self.a1_w_m2k + 2.0 * m;
        let c = s + 2.0 * m * (t_in_c - ta_c);
        let x = 2.0 * c / (b + (b * b + 4.0 * self.a2_w_m2k2 * c.abs()).sqrt());
        let t_out = 2.0 * (ta_c + x) - t_in_c;
        (t_out, m * (t_out - t_in_c))
    }

    /// No-flow (stagnation) mean temperature, °C: the `tm` at which the useful power is zero,
    /// root of `η0 (Kb Gb + Kd Gd) = a1 Δ + a2 Δ²`, `Δ = 2S / (a1 + √(a1² + 4 a2 S))`.
    ///
    /// * arguments as in [`Self::useful_w_m2`]
    ///
    /// Returns `ta_c` at zero irradiance. A steady-state estimate with the collector's test
    /// coefficients (extrapolated when Δ is far above the tested range); it is not capped at
    /// `max_temp_c`. The spec must have been validated (a1 and a2 not both zero).
    ///
    /// Source: ISO 9806:2017 steady-state model set to q = 0.
    pub fn stagnation_c(
        &self,
        g_beam_w_m2: f64,
        g_diffuse_w_m2: f64,
        aoi_deg: f64,
        ta_c: f64,
    ) -> f64 {
        ta_c + self.stagnation_delta_k(self.absorbed_w_m2(g_beam_w_m2, g_diffuse_w_m2, aoi_deg))
    }

    /// Area of one module on the area basis of the coefficients, m².
    pub fn area_m2(&self) -> f64 {
        match self.area_basis {
            AreaBasis::Aperture => self.aperture_m2,
            AreaBasis::Gross => self.gross_m2,
        }
    }

    /// Absorbed power `S = η0 (Kb Gb + Kd Gd)` per m², W/m².
    fn absorbed_w_m2(&self, g_beam_w_m2: f64, g_diffuse_w_m2: f64, aoi_deg: f64) -> f64 {
        let gb = g_beam_w_m2.max(0.0);
        let gd = if self.kind == CollectorKind::Concentrating {
            0.0
        } else {
            g_diffuse_w_m2.max(0.0)
        };
        self.eta0 * (self.iam_beam(aoi_deg) * gb + self.iam_diffuse * gd)
    }

    /// Heat loss per m², W/m², at `dt = tm − ta`: `a1 Δ + a2 |Δ| Δ`.
    fn loss_w_m2(&self, dt_k: f64) -> f64 {
        self.a1_w_m2k * dt_k + self.a2_w_m2k2 * dt_k.abs() * dt_k
    }

    /// Δ at which the loss equals `s` (≥ 0), K.
    fn stagnation_delta_k(&self, s_w_m2: f64) -> f64 {
        let a1 = self.a1_w_m2k;
        let den = a1 + (a1 * a1 + 4.0 * self.a2_w_m2k2 * s_w_m2.abs()).sqrt();
        if den > 0.0 { 2.0 * s_w_m2 / den } else { 0.0 }
    }
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
        assert_eq!(c.area_m2(), 2.0);
        c.validate().unwrap();
    }
}
