//! Heat exchangers by the effectiveness–NTU method, and the collector heat-exchanger factor
//! for an indirect (antifreeze) collector loop.
//!
//! Sources: F.P. Incropera, D.P. DeWitt, T.L. Bergman, A.S. Lavine, *Fundamentals of Heat and
//! Mass Transfer*, 7th ed., Wiley 2011, §11.4, Table 11.3 (ε–NTU relations); J.A. Duffie,
//! W.A. Beckman, *Solar Engineering of Thermal Processes*, 4th ed., Wiley 2013, §10.2,
//! eq. 10.2.3 (collector heat-exchanger factor).

/// Effectiveness of a counterflow heat exchanger, dimensionless.
///
/// `ε = (1 − exp(−NTU (1 − Cr))) / (1 − Cr exp(−NTU (1 − Cr)))` for `Cr < 1`, and
/// `ε = NTU / (1 + NTU)` for `Cr = 1`. Evaluated as
/// `ε = e / ((1 − Cr) + Cr e)` with `e = −expm1(−NTU (1 − Cr))`, which has no cancellation as
/// `Cr → 1` and meets the `Cr = 1` limit continuously; `Cr = 0` gives `1 − exp(−NTU)`.
///
/// * `ntu` – number of transfer units `UA / C_min`, dimensionless (negative or NaN taken as 0)
/// * `c_ratio` – `C_min / C_max`, clamped to `[0, 1]` (NaN taken as 0)
///
/// Returns ε in `[0, 1)`.
///
/// Source: Incropera et al., 7th ed., Table 11.3 (counterflow, eqs. 11.29a/b).
pub fn effectiveness_counterflow(ntu: f64, c_ratio: f64) -> f64 {
    let ntu = ntu.max(0.0);
    let cr = if c_ratio.is_nan() {
        0.0
    } else {
        c_ratio.clamp(0.0, 1.0)
    };
    let x = ntu * (1.0 - cr);
    if x == 0.0 {
        return ntu / (1.0 + ntu);
    }
    let e = -(-x).exp_m1();
    e / ((1.0 - cr) + cr * e)
}

/// Heat transferred by an exchanger of effectiveness `eff`, W: `Q = ε C_min (T_h,in − T_c,in)`.
///
/// * `eff` – effectiveness, dimensionless (0..1)
/// * `c_min_w_k` – smaller capacity rate `ṁ cp`, W/K
/// * `t_hot_in_c`, `t_cold_in_c` – inlet temperatures of the hot and cold streams, °C
///
/// Negative when the "hot" inlet is the colder one (heat flows the other way).
///
/// Source: Incropera et al., 7th ed., §11.4, eq. 11.22 (definition of ε; from memory).
pub fn heat_rate_w(eff: f64, c_min_w_k: f64, t_hot_in_c: f64, t_cold_in_c: f64) -> f64 {
    eff * c_min_w_k * (t_hot_in_c - t_cold_in_c)
}

/// Collector heat-exchanger factor `F_R'/F_R`, dimensionless: the factor by which an
/// indirect loop reduces `F_R (τα)` and `F_R U_L` of the collector array.
///
/// `F_R'/F_R = [1 + (A_c F_R U_L / C_c) (C_c / (ε C_min) − 1)]⁻¹`
///
/// * `area_m2` – collector area A_c, m² (basis of `fr_ul_w_m2k`)
/// * `fr_ul_w_m2k` – the array's F_R U_L, W/(m²·K)
/// * `c_collector_w_k` – collector-loop capacity rate `(ṁ cp)_c`, W/K
/// * `eff` – exchanger effectiveness ε, dimensionless
/// * `c_min_w_k` – smaller capacity rate of the exchanger, W/K (≤ `c_collector_w_k`)
///
/// Returns a value in `(0, 1]` for valid inputs (1 for a perfect exchanger with
/// `C_min = C_c`); 0 when `ε C_min ≤ 0` or `C_c ≤ 0` (no heat can pass).
///
/// Source: Duffie & Beckman, 4th ed., §10.2, eq. 10.2.3 (de Winter's factor).
pub fn collector_hx_factor(
    area_m2: f64,
    fr_ul_w_m2k: f64,
    c_collector_w_k: f64,
    eff: f64,
    c_min_w_k: f64,
) -> f64 {
    let ec = eff * c_min_w_k;
    if ec.is_nan() || ec <= 0.0 || c_collector_w_k.is_nan() || c_collector_w_k <= 0.0 {
        return 0.0;
    }
    let a_frul = area_m2 * fr_ul_w_m2k;
    1.0 / (1.0 + a_frul / c_collector_w_k * (c_collector_w_k / ec - 1.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Incropera 7th ed. Table 11.3 closed forms, values by hand: NTU = 1, Cr = 0:
    /// 1 − e⁻¹ = 0.632121; NTU = 2, Cr = 0.5: (1 − e⁻¹)/(1 − 0.5 e⁻¹) = 0.774600;
    /// NTU = 3, Cr = 1: 3/4.
    #[test]
    fn counterflow_values() {
        assert!((effectiveness_counterflow(1.0, 0.0) - 0.632121).abs() < 1e-6);
        assert!((effectiveness_counterflow(2.0, 0.5) - 0.774600).abs() < 1e-6);
        assert!((effectiveness_counterflow(3.0, 1.0) - 0.75).abs() < 1e-15);
    }

    /// The Cr → 1 limit is continuous (no 0/0): at Cr = 1 − 1e−9 within 1e−9 of NTU/(1+NTU).
    #[test]
    fn counterflow_cr_one_limit() {
        for ntu in [0.1, 1.0, 5.0, 50.0] {
            let lim = ntu / (1.0 + ntu);
            let near = effectiveness_counterflow(ntu, 1.0 - 1e-9);
            assert!((near - lim).abs() < 1e-8, "NTU {ntu}: {near} vs {lim}");
        }
        assert_eq!(effectiveness_counterflow(0.0, 0.3), 0.0);
        assert!(effectiveness_counterflow(f64::NAN, f64::NAN).is_finite());
    }

    #[test]
    fn heat_rate_by_definition() {
        // ε = 0.6, C_min = 2000 W/K, 70 → 40 °C: 0.6·2000·30 = 36 kW
        assert!((heat_rate_w(0.6, 2000.0, 70.0, 40.0) - 36_000.0).abs() < 1e-9);
    }

    /// Perfect exchanger with C_min = C_c gives no penalty; otherwise by hand with
    /// A F_R U_L = 200 W/K, C_c = 2000 W/K, ε = 0.7, C_min = 2000 W/K:
    /// 1/(1 + 0.1·(1/0.7 − 1)) = 0.958904 (D&B 4th ed. eq. 10.2.3).
    #[test]
    fn hx_factor_by_hand() {
        assert!((collector_hx_factor(50.0, 4.0, 2000.0, 1.0, 2000.0) - 1.0).abs() < 1e-15);
        let f = collector_hx_factor(50.0, 4.0, 2000.0, 0.7, 2000.0);
        assert!((f - 0.958904).abs() < 1e-6, "{f}");
        assert_eq!(collector_hx_factor(50.0, 4.0, 2000.0, 0.0, 2000.0), 0.0);
    }
}
