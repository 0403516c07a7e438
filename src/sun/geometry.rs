//! Sun–earth geometry of Duffie & Beckman: declination, equation of time, hour angle,
//! extraterrestrial irradiance and the sunset hour angle.
//!
//! These are the closed-form relations used by the daily→hourly weather methods (which are
//! defined in solar time) and by the checks against Duffie & Beckman's worked examples.
//! The sun's position for the hour loop comes from SPA (`sun::position`), not from here.
//!
//! Angles in degrees unless the name says otherwise; `n` is the day of the year, 1..=366.
//!
//! Source: J.A. Duffie, W.A. Beckman, *Solar Engineering of Thermal Processes*, 4th ed.,
//! Wiley 2013, §1.4–1.10 (equation numbers below refer to it).

/// Solar constant used with these relations, W/m² (Duffie & Beckman §1.2: 1367 W/m²,
/// the WRC value they adopt).
pub const SOLAR_CONSTANT_W_M2: f64 = 1367.0;

/// Declination by Cooper's equation (D&B eq. 1.6.1a): `δ = 23.45 sin(360 (284 + n) / 365)`.
pub fn declination_cooper_deg(n: u32) -> f64 {
    23.45 * (360.0 * (284.0 + n as f64) / 365.0).to_radians().sin()
}

/// Spencer's day angle `B = (n − 1) 360/365` (D&B eq. 1.4.2), radians.
fn day_angle_rad(n: u32) -> f64 {
    ((n as f64 - 1.0) * 360.0 / 365.0).to_radians()
}

/// Declination by Spencer's series (D&B eq. 1.6.1b), more accurate than Cooper's (< 0.035°).
pub fn declination_spencer_deg(n: u32) -> f64 {
    let b = day_angle_rad(n);
    (180.0 / std::f64::consts::PI)
        * (0.006918 - 0.399912 * b.cos() + 0.070257 * b.sin() - 0.006758 * (2.0 * b).cos()
            + 0.000907 * (2.0 * b).sin()
            - 0.002697 * (3.0 * b).cos()
            + 0.00148 * (3.0 * b).sin())
}

/// Equation of time, minutes (D&B eq. 1.5.3, Spencer).
pub fn equation_of_time_min(n: u32) -> f64 {
    let b = day_angle_rad(n);
    229.2
        * (0.000075 + 0.001868 * b.cos()
            - 0.032077 * b.sin()
            - 0.014615 * (2.0 * b).cos()
            - 0.04089 * (2.0 * b).sin())
}

/// Solar time (hours) from local standard time (hours) — D&B eq. 1.5.2 written with
/// longitudes east-positive: `solar = standard + 4 (L_loc − 15·utc_offset)/60 + E/60`.
pub fn solar_time_h(standard_h: f64, n: u32, longitude_deg: f64, utc_offset_h: f64) -> f64 {
    standard_h + (4.0 * (longitude_deg - 15.0 * utc_offset_h) + equation_of_time_min(n)) / 60.0
}

/// Hour angle from solar time, degrees, morning negative (D&B §1.6): `ω = 15 (t − 12)`.
pub fn hour_angle_deg(solar_h: f64) -> f64 {
    15.0 * (solar_h - 12.0)
}

/// Extraterrestrial irradiance on a plane normal to the beam, W/m² (D&B eq. 1.4.1b, Spencer).
pub fn extraterrestrial_normal_w_m2(n: u32) -> f64 {
    let b = day_angle_rad(n);
    SOLAR_CONSTANT_W_M2
        * (1.000110
            + 0.034221 * b.cos()
            + 0.001280 * b.sin()
            + 0.000719 * (2.0 * b).cos()
            + 0.000077 * (2.0 * b).sin())
}

/// Cosine of the zenith angle (D&B eq. 1.6.5), may be negative (sun below horizon).
pub fn cos_zenith(latitude_deg: f64, declination_deg: f64, hour_angle_deg: f64) -> f64 {
    let (p, d, w) = (
        latitude_deg.to_radians(),
        declination_deg.to_radians(),
        hour_angle_deg.to_radians(),
    );
    p.cos() * d.cos() * w.cos() + p.sin() * d.sin()
}

/// Sunset hour angle, degrees (D&B eq. 1.6.10): `cos ωs = −tan φ tan δ`, clamped to
/// 0° (polar night) and 180° (midnight sun).
pub fn sunset_hour_angle_deg(latitude_deg: f64, declination_deg: f64) -> f64 {
    let c = -latitude_deg.to_radians().tan() * declination_deg.to_radians().tan();
    c.clamp(-1.0, 1.0).acos().to_degrees()
}

/// Daily extraterrestrial irradiation on a horizontal surface, J/m² (D&B eq. 1.10.3).
pub fn daily_extraterrestrial_j_m2(n: u32, latitude_deg: f64) -> f64 {
    let d = declination_cooper_deg(n);
    let ws = sunset_hour_angle_deg(latitude_deg, d);
    let (p, dr, wr) = (latitude_deg.to_radians(), d.to_radians(), ws.to_radians());
    let g_on = SOLAR_CONSTANT_W_M2 * (1.0 + 0.033 * (360.0 * n as f64 / 365.0).to_radians().cos());
    24.0 * 3600.0 / std::f64::consts::PI
        * g_on
        * (p.cos() * dr.cos() * wr.sin() + wr * p.sin() * dr.sin())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// D&B Example 1.10.1 (4th ed.): φ = 43°, April 15 (n = 105): H0 = 33.8 MJ/m².
    #[test]
    fn daily_extraterrestrial_example_1_10_1() {
        let h0 = daily_extraterrestrial_j_m2(105, 43.0) / 1e6;
        assert!((h0 - 33.8).abs() < 0.1, "H0 = {h0}");
    }

    /// D&B Example 1.6.3 (4th ed., from memory): φ = 43°, n = 41 (10 Feb, δ = −14.9° by
    /// Cooper's equation).
    #[test]
    fn cooper_declination_feb_10() {
        assert!((declination_cooper_deg(41) + 14.9).abs() < 0.1);
    }
}
