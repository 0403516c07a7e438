//! Peng–Robinson (1976) cubic equation of state for pure fluids, with an ideal-gas heat
//! capacity polynomial: compressibility roots, fugacity, enthalpy and entropy departures and
//! the saturation line by equal fugacities.
//!
//! `p = R T / (v − b) − a(T) / (v² + 2 b v − b²)`, `a = 0.45724 R² Tc² / pc · α(T)`,
//! `b = 0.07780 R Tc / pc`, `α = [1 + κ (1 − √(T/Tc))]²`,
//! `κ = 0.37464 + 1.54226 ω − 0.26992 ω²` (no volume translation).
//!
//! In `Z = p v / (R T)`, `A = a p / (R T)²`, `B = b p / (R T)`:
//! `Z³ − (1 − B) Z² + (A − 3B² − 2B) Z − (A B − B² − B³) = 0`;
//! `ln φ = Z − 1 − ln(Z − B) − A / (2√2 B) · L`,
//! `(h − h°)/ (R T) = Z − 1 + (T a' − a) / (2√2 b R T) · L`,
//! `(s − s°(T, p)) / R = ln(Z − B) + a' / (2√2 b R) · L`,
//! with `L = ln[(Z + (1 + √2) B) / (Z + (1 − √2) B)]` and `a' = da/dT`.
//!
//! Source: D.-Y. Peng, D. B. Robinson, "A New Two-Constant Equation of State", Ind. Eng. Chem.
//! Fundam. 15 (1976) 59–64; departure functions as in B. E. Poling, J. M. Prausnitz,
//! J. P. O'Connell, The Properties of Gases and Liquids, 5th ed., §4-6 and §6-4 (Table 6-3).
//! Everything here is molar SI (K, Pa, J/mol); `fluids.rs` turns it into per-kg engineering units.

use crate::error::{Error, Result};
use roots::find_roots_cubic;

/// Molar gas constant, J/(mol·K) (CODATA 2018, exact).
pub const R_J_MOLK: f64 = 8.314_462_618;
/// Peng–Robinson Ω_a (Peng & Robinson 1976, eq. 9).
const OMEGA_A: f64 = 0.45724;
/// Peng–Robinson Ω_b (Peng & Robinson 1976, eq. 10).
const OMEGA_B: f64 = 0.07780;
/// Critical compressibility of the Peng–Robinson equation (Peng & Robinson 1976: 0.307).
const Z_C: f64 = 0.307_401;
const SQRT2: f64 = std::f64::consts::SQRT_2;
/// Temperature at which the ideal-gas enthalpy and entropy integrals start, K (arbitrary: the
/// fluid layer shifts h and s to the IIR reference state).
const T_IG_REF_K: f64 = 273.15;
/// Pressure of the ideal-gas entropy reference, Pa (arbitrary, see above).
const P_IG_REF_PA: f64 = 101_325.0;

/// The constants of one fluid.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PrFluid {
    /// Critical temperature, K.
    pub tc_k: f64,
    /// Critical pressure, Pa.
    pub pc_pa: f64,
    /// Acentric factor.
    pub omega: f64,
    /// Molar mass, kg/mol.
    pub m_kg_mol: f64,
    /// Ideal-gas heat capacity `cp°/R = Σ c_k (T/100 K)^k`, k = 0..4.
    pub cp0_r: [f64; 5],
}

/// One root of the cubic at (T, p), with the quantities that follow from it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PrPoint {
    /// Compressibility factor.
    pub z: f64,
    /// Molar volume, m³/mol.
    pub v_m3_mol: f64,
    /// Natural log of the fugacity coefficient.
    pub ln_phi: f64,
    /// Enthalpy minus the ideal gas's at the same T, J/mol.
    pub h_dep_j_mol: f64,
    /// Entropy minus the ideal gas's at the same T and p, J/(mol·K).
    pub s_dep_j_molk: f64,
}

/// Which root to take where the cubic has three.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Phase {
    /// Smallest volume.
    Liquid,
    /// Largest volume.
    Vapour,
    /// The root of lowest Gibbs energy (stable phase).
    Stable,
}

impl PrFluid {
    /// `a(T)` in Pa·m⁶/mol², its temperature derivative in Pa·m⁶/(mol²·K), and `b` in m³/mol
    /// (Peng & Robinson 1976, eqs. 9–12 and 17–18).
    ///
    /// * `t_k` – temperature, K (> 0)
    pub fn ab(&self, t_k: f64) -> (f64, f64, f64) {
        let kappa = 0.37464 + 1.54226 * self.omega - 0.26992 * self.omega * self.omega;
        let ac = OMEGA_A * R_J_MOLK * R_J_MOLK * self.tc_k * self.tc_k / self.pc_pa;
        let sr = (t_k / self.tc_k).sqrt();
        let sqrt_alpha = 1.0 + kappa * (1.0 - sr);
        let a = ac * sqrt_alpha * sqrt_alpha;
        // d/dT [ac (1 + κ(1 − √(T/Tc)))²] = −ac κ √α / √(T Tc)
        let dadt = -ac * kappa * sqrt_alpha / (t_k * self.tc_k).sqrt();
        let b = OMEGA_B * R_J_MOLK * self.tc_k / self.pc_pa;
        (a, dadt, b)
    }

    /// Molar volume at the Peng–Robinson critical point, m³/mol: `Zc R Tc / pc`, Zc = 0.3074.
    /// A single real root smaller than this is on the liquid branch, larger on the vapour one.
    pub fn v_crit_m3_mol(&self) -> f64 {
        Z_C * R_J_MOLK * self.tc_k / self.pc_pa
    }

    /// Real compressibility roots above `B` at (T, p), ascending, polished by Newton steps on
    /// the cubic; returns the roots array and how many are valid (1 to 3).
    ///
    /// * `t_k` – temperature, K; `p_pa` – pressure, Pa (both > 0, finite)
    ///
    /// Source: cubic in Z of Peng & Robinson 1976, eq. 5; `roots::find_roots_cubic`.
    pub fn z_roots(&self, t_k: f64, p_pa: f64) -> ([f64; 3], usize) {
        let (a, _, b) = self.ab(t_k);
        let rt = R_J_MOLK * t_k;
        let aa = a * p_pa / (rt * rt);
        let bb = b * p_pa / rt;
        let c2 = -(1.0 - bb);
        let c1 = aa - 3.0 * bb * bb - 2.0 * bb;
        let c0 = -(aa * bb - bb * bb - bb * bb * bb);
        let mut out = [0.0; 3];
        let mut n = 0;
        let r = find_roots_cubic(1.0, c2, c1, c0);
        for &z0 in r.as_ref() {
            let mut z = z0;
            for _ in 0..3 {
                let f = ((z + c2) * z + c1) * z + c0;
                let d = (3.0 * z + 2.0 * c2) * z + c1;
                if d == 0.0 {
                    break;
                }
                z -= f / d;
            }
            if z.is_finite() && z > bb && n < 3 {
                out[n] = z;
                n += 1;
            }
        }
        out[..n].sort_by(f64::total_cmp);
        (out, n)
    }

    /// Fugacity, volume and departures of the root `z` at (T, p) (module equations).
    ///
    /// * `t_k` – K; `p_pa` – Pa; `z` – a compressibility root above B from [`Self::z_roots`]
    pub fn point(&self, t_k: f64, p_pa: f64, z: f64) -> PrPoint {
        let (a, dadt, b) = self.ab(t_k);
        let rt = R_J_MOLK * t_k;
        let aa = a * p_pa / (rt * rt);
        let bb = b * p_pa / rt;
        let l = ((z + (1.0 + SQRT2) * bb) / (z + (1.0 - SQRT2) * bb)).ln();
        let ln_phi = z - 1.0 - (z - bb).ln() - aa / (2.0 * SQRT2 * bb) * l;
        let h_dep = rt * (z - 1.0) + (t_k * dadt - a) / (2.0 * SQRT2 * b) * l;
        let s_dep = R_J_MOLK * (z - bb).ln() + dadt / (2.0 * SQRT2 * b) * l;
        PrPoint {
            z,
            v_m3_mol: z * rt / p_pa,
            ln_phi,
            h_dep_j_mol: h_dep,
            s_dep_j_molk: s_dep,
        }
    }

    /// The root for `phase` at (T, p). Where the cubic has one real root it is returned
    /// whatever the phase asked.
    pub fn phase_point(&self, t_k: f64, p_pa: f64, phase: Phase) -> Result<PrPoint> {
        let (z, n) = self.z_roots(t_k, p_pa);
        if n == 0 {
            return Err(Error::Internal(format!(
                "Peng-Robinson: no compressibility root above B at T = {t_k} K, p = {p_pa} Pa"
            )));
        }
        Ok(match phase {
            Phase::Liquid => self.point(t_k, p_pa, z[0]),
            Phase::Vapour => self.point(t_k, p_pa, z[n - 1]),
            Phase::Stable => {
                let lo = self.point(t_k, p_pa, z[0]);
                let hi = self.point(t_k, p_pa, z[n - 1]);
                if lo.ln_phi <= hi.ln_phi { lo } else { hi }
            }
        })
    }

    /// Ideal-gas enthalpy from 273.15 K, J/mol: `∫ cp° dT`.
    pub fn h_ideal_j_mol(&self, t_k: f64) -> f64 {
        let (x, x0) = (t_k / 100.0, T_IG_REF_K / 100.0);
        let mut sum = 0.0;
        let (mut xp, mut x0p) = (x, x0);
        for (k, c) in self.cp0_r.iter().enumerate() {
            sum += c * (xp - x0p) / (k as f64 + 1.0);
            xp *= x;
            x0p *= x0;
        }
        R_J_MOLK * 100.0 * sum
    }

    /// Ideal-gas entropy from (273.15 K, 101.325 kPa), J/(mol·K): `∫ cp°/T dT − R ln(p/p0)`.
    pub fn s_ideal_j_molk(&self, t_k: f64, p_pa: f64) -> f64 {
        let (x, x0) = (t_k / 100.0, T_IG_REF_K / 100.0);
        let mut sum = self.cp0_r[0] * (x / x0).ln();
        let (mut xp, mut x0p) = (x, x0);
        for (k, c) in self.cp0_r.iter().enumerate().skip(1) {
            sum += c * (xp - x0p) / k as f64;
            xp *= x;
            x0p *= x0;
        }
        R_J_MOLK * (sum - (p_pa / P_IG_REF_PA).ln())
    }

    /// Real-fluid molar enthalpy, J/mol (ideal gas from 273.15 K plus departure).
    pub fn h_j_mol(&self, t_k: f64, pt: &PrPoint) -> f64 {
        self.h_ideal_j_mol(t_k) + pt.h_dep_j_mol
    }

    /// Real-fluid molar entropy, J/(mol·K) (ideal gas from 273.15 K, 101.325 kPa plus departure).
    pub fn s_j_molk(&self, t_k: f64, p_pa: f64, pt: &PrPoint) -> f64 {
        self.s_ideal_j_molk(t_k, p_pa) + pt.s_dep_j_molk
    }

    /// `ln φ_V − ln φ_L` at (T, p) where both roots exist; where only one exists, −1 if it is
    /// on the vapour branch (p below the liquid spinodal: below saturation) and +1 if on the
    /// liquid branch. Increasing in p (d/d ln p = Z_V − Z_L > 0), so its sign change is the
    /// saturation pressure.
    fn sat_residual(&self, t_k: f64, ln_p: f64) -> f64 {
        let p = ln_p.exp();
        let (z, n) = self.z_roots(t_k, p);
        if n >= 2 && z[n - 1] - z[0] > 1e-12 {
            self.point(t_k, p, z[n - 1]).ln_phi - self.point(t_k, p, z[0]).ln_phi
        } else if n == 0 {
            f64::NAN
        } else if z[0] * R_J_MOLK * t_k / p > self.v_crit_m3_mol() {
            -1.0
        } else {
            1.0
        }
    }

    /// Saturation pressure at `t_k` by equal fugacities of the liquid and vapour roots, with
    /// both saturated states.
    ///
    /// Brent's method on `ln p` between the Wilson estimate `ln(p/pc) = 5.373 (1 + ω)(1 − Tc/T)`
    /// minus 6 and `ln pc` (the residual is a signed step outside the three-root range, so the
    /// bracket always holds and the method stays robust up to the critical point).
    ///
    /// * `t_k` – temperature, K, with `0.3 Tc ≤ T ≤ Tc − 0.05 K`
    ///
    /// Returns `(p_sat_pa, liquid, vapour)`. Error `OutOfRange` outside the range.
    /// Source: equal-fugacity condition, Poling, Prausnitz & O'Connell, 5th ed., ch. 7; the
    /// bracket's estimate is G. M. Wilson's (1968) K-value form (from memory; used only to
    /// place the bracket, never in the result).
    pub fn saturation(&self, t_k: f64) -> Result<(f64, PrPoint, PrPoint)> {
        if !(t_k.is_finite() && t_k >= 0.3 * self.tc_k && t_k <= self.tc_k - 0.05) {
            return Err(Error::OutOfRange {
                model: "Peng-Robinson saturation",
                quantity: "temperature, K",
                value: t_k,
                range: format!("{:.2}..{:.2} K", 0.3 * self.tc_k, self.tc_k - 0.05),
            });
        }
        let ln_pc = self.pc_pa.ln();
        let ln_w = ln_pc + 5.373 * (1.0 + self.omega) * (1.0 - self.tc_k / t_k);
        let lo = ln_w.min(ln_pc) - 6.0;
        let hi = ln_pc;
        let ln_p = crate::num::brent("Peng-Robinson saturation pressure", lo, hi, 1e-13, |x| {
            self.sat_residual(t_k, x)
        })?;
        let p = ln_p.exp();
        let (z, n) = self.z_roots(t_k, p);
        if n < 2 {
            return Err(Error::Internal(format!(
                "Peng-Robinson saturation at {t_k} K: single root at the solved pressure {p} Pa"
            )));
        }
        Ok((p, self.point(t_k, p, z[0]), self.point(t_k, p, z[n - 1])))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Propane constants (CoolProp 6.6.0 fluid file: Tc 369.89 K, pc 4.2512 MPa, ω 0.1521).
    fn propane() -> PrFluid {
        PrFluid {
            tc_k: 369.89,
            pc_pa: 4.2512e6,
            omega: 0.1521,
            m_kg_mol: 0.044_095_62,
            cp0_r: [
                5.978_274_678_659_309,
                -1.677_602_509_748_450_2,
                1.375_227_610_606_876_8,
                -0.190_838_753_557_026_18,
                0.008_593_769_759_170_24,
            ],
        }
    }

    /// At the critical point the cubic has a triple root Z = Zc = 0.3074 (Peng & Robinson 1976,
    /// p. 60: "Zc = 0.307"). Ω_a, Ω_b are the paper's 5-digit roundings, so the coefficients
    /// are off a true triple root by about 1e-5 and the root moves by the cube root of that
    /// (≈ 0.02): the tolerance.
    #[test]
    fn triple_root_at_critical_point() {
        let f = propane();
        let (z, n) = f.z_roots(f.tc_k, f.pc_pa);
        assert!(n >= 1);
        for zi in &z[..n] {
            assert!((zi - 0.3074).abs() < 0.02, "{z:?}");
        }
    }

    /// By the definition of ω, p_sat(0.7 Tc) = pc · 10^(−1−ω) (Pitzer); PR reproduces ω by
    /// construction of κ to within about 1 % in pressure (Peng & Robinson 1976, fig. 1 fit).
    #[test]
    fn acentric_factor_definition() {
        let f = propane();
        let (p, l, v) = f.saturation(0.7 * f.tc_k).unwrap();
        let expected = f.pc_pa * 10f64.powf(-1.0 - f.omega);
        assert!((p / expected - 1.0).abs() < 0.02, "{p} vs {expected}");
        assert!((l.ln_phi - v.ln_phi).abs() < 1e-9);
        assert!(l.z < v.z);
    }

    /// Robust near the critical point: converges at Tc − 0.1 K with distinct phases.
    #[test]
    fn saturation_near_critical() {
        let f = propane();
        let (p, l, v) = f.saturation(f.tc_k - 0.1).unwrap();
        assert!(p < f.pc_pa && p > 0.95 * f.pc_pa);
        assert!(v.z > l.z + 1e-3, "{} {}", l.z, v.z);
        assert!(f.saturation(f.tc_k + 1.0).is_err());
        assert!(f.saturation(f64::NAN).is_err());
    }

    /// Low-pressure limit: the departures approach the second-virial forms with the PR second
    /// virial coefficient `B2 = b − a/(R T)`: `h_dep → p (B2 − T dB2/dT) = p (b − 2a/(RT) + a'/R)`,
    /// `s_dep → −p dB2/dT = −p (a/(R T²) − a'/(R T))` (Poling et al. 5th ed., ch. 4, virial
    /// equation). At 1 Pa they agree within 1e-4 relative.
    #[test]
    fn ideal_gas_limit() {
        let f = propane();
        let (t, p) = (300.0, 1.0);
        let pt = f.phase_point(t, p, Phase::Vapour).unwrap();
        let (a, da, b) = f.ab(t);
        let rt = R_J_MOLK * t;
        let h_virial = p * (b - 2.0 * a / rt + da / R_J_MOLK);
        let s_virial = -p * (a / (rt * t) - da / rt);
        assert!((pt.z - 1.0).abs() < 1e-5);
        assert!(
            (pt.h_dep_j_mol / h_virial - 1.0).abs() < 1e-4,
            "{}",
            pt.h_dep_j_mol
        );
        assert!(
            (pt.s_dep_j_molk / s_virial - 1.0).abs() < 1e-4,
            "{}",
            pt.s_dep_j_molk
        );
    }

    /// Departure enthalpy is consistent with the T-derivative of ln φ:
    /// `h_dep = −R T² ∂(ln φ)/∂T` at constant p (Gibbs–Helmholtz relation, since
    /// `R T ln φ = g − g°` at the same T and p).
    #[test]
    fn departure_consistency() {
        let f = propane();
        let (t, p, dt) = (320.0, 5.0e5, 1e-3);
        let lnphi = |t: f64| f.phase_point(t, p, Phase::Vapour).unwrap().ln_phi;
        let d = (lnphi(t + dt) - lnphi(t - dt)) / (2.0 * dt);
        let h = f.phase_point(t, p, Phase::Vapour).unwrap().h_dep_j_mol;
        assert!((h + R_J_MOLK * t * t * d).abs() < 1e-3 * h.abs(), "{h}");
    }
}
