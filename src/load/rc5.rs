//! ISO 13790:2008 simple hourly method: the five-resistance, one-capacitance (5R1C) network of
//! Annex C, with the ideal-load (unlimited capacity) heating and cooling need of §C.4.
//!
//! Nodes: outdoor air θ_e, supply air θ_sup (= θ_e here: no heat recovery), indoor air θ_air,
//! a central "star" node θ_s (mix of indoor surface and air radiant temperature) and the
//! building mass θ_m with heat capacity C_m. Conductances: H_ve (air ↔ supply), H_tr,is
//! (air ↔ star), H_tr,w (star ↔ outdoor, windows), H_tr,ms (star ↔ mass), H_tr,em (mass ↔
//! outdoor, opaque envelope). Heating/cooling Φ_HC,nd goes to the air node; heating positive,
//! cooling negative.
//!
//! Source: ISO 13790:2008 "Energy performance of buildings — Calculation of energy use for
//! space heating and cooling", §7.2.2 (A_t = 4.5 A_f), §12.2.2 (H_tr,ms, H_tr,em), Table 12
//! (mass classes), Annex C eqs. C.1–C.13. Equation numbers and coefficients are from memory;
//! the equations were compared term by term with the PyPI library rcbsim 0.3b0
//! (`building_physics.py`), which implements the same Annex C, and the check table
//! `reference/load_rc5_rcbsim.csv` compares whole hour steps with it.
//!
//! Not modelled (documented simplifications): heat recovery on ventilation, capacity limits
//! (steps 4–5 of §C.4: the need is always met), thermal radiation to the sky (ISO 13790
//! §11.3.5), solar gains on opaque walls (only an optional roof term), moisture buffering of
//! the building fabric.

use super::schedule::DaySchedule;
use super::{BuildingHourInput, LoadHour, LoadYear};
use crate::error::{Error, Result};
use crate::validate;
use crate::weather::HOURS;

/// Heat transfer coefficient between the star node and the internal surfaces / mass,
/// h_ms = 9.1 W/(m²K) (ISO 13790:2008 §12.2.2, eq. 64; from memory).
pub const H_MS_W_M2K: f64 = 9.1;
/// Heat transfer coefficient between the air node and the star node,
/// h_is = 3.45 W/(m²K) (ISO 13790:2008 §7.2.2.2, eq. 9; from memory).
pub const H_IS_W_M2K: f64 = 3.45;
/// Ratio of the area of all surfaces facing the zone to the floor area, Λ_at = 4.5
/// (ISO 13790:2008 §7.2.2.2; from memory).
pub const LAMBDA_AT: f64 = 4.5;
/// Heat capacity of air per volume, ρ_a c_a = 1200 J/(m³K) (ISO 13790:2008 §9.3.1, eq. 21;
/// from memory).
pub const RHO_C_AIR_J_M3K: f64 = 1200.0;
/// Density of standard air, 1.204 kg/m³ at 20 °C and 101.325 kPa (ASHRAE Handbook—
/// Fundamentals 2017, ch. 1 / ch. 16 standard air; from memory). Used for the moisture flow.
pub const RHO_AIR_KG_M3: f64 = 1.204;
/// Latent heat of vaporisation used for latent loads, 2501 kJ/kg: the h_g constant at 0 °C of
/// ASHRAE Handbook—Fundamentals 2017 ch. 1 eq. 30, `h = 1.006 t + W (2501 + 1.86 t)`.
pub const H_FG_J_KG: f64 = 2_501_000.0;
/// External surface resistance R_se = 0.04 m²K/W (ISO 6946, used by ISO 13790:2008 §11.3.4
/// for the solar gain of opaque elements; from memory).
pub const R_SE_M2K_W: f64 = 0.04;
/// The "10 W/m²" test power of §C.4.2 step 2, W per m² of floor.
const PHI_TEST_W_M2: f64 = 10.0;

/// Building mass class of ISO 13790:2008 Table 12.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum MassClass {
    /// Very light construction.
    VeryLight,
    /// Light construction.
    Light,
    /// Medium construction.
    Medium,
    /// Heavy construction.
    Heavy,
    /// Very heavy construction.
    VeryHeavy,
}

impl MassClass {
    /// Effective mass area and internal heat capacity per floor area:
    /// `(A_m / A_f, C_m / A_f in J/(m²K))`.
    ///
    /// ISO 13790:2008 Table 12 (from memory): very light 2.5 / 80 000, light 2.5 / 110 000,
    /// medium 2.5 / 165 000, heavy 3.0 / 260 000, very heavy 3.5 / 370 000.
    pub fn per_floor_area(self) -> (f64, f64) {
        match self {
            MassClass::VeryLight => (2.5, 80_000.0),
            MassClass::Light => (2.5, 110_000.0),
            MassClass::Medium => (2.5, 165_000.0),
            MassClass::Heavy => (3.0, 260_000.0),
            MassClass::VeryHeavy => (3.5, 370_000.0),
        }
    }

    /// The scenario spelling (`"very-light"` … `"very-heavy"`).
    pub fn name(self) -> &'static str {
        match self {
            MassClass::VeryLight => "very-light",
            MassClass::Light => "light",
            MassClass::Medium => "medium",
            MassClass::Heavy => "heavy",
            MassClass::VeryHeavy => "very-heavy",
        }
    }
}

/// Window areas (overall, frame included) per facade orientation, m².
#[derive(Debug, Clone, Copy, Default, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct WindowAreas {
    /// Facing north, m².
    #[serde(default)]
    pub north_m2: f64,
    /// Facing east, m².
    #[serde(default)]
    pub east_m2: f64,
    /// Facing south, m².
    #[serde(default)]
    pub south_m2: f64,
    /// Facing west, m².
    #[serde(default)]
    pub west_m2: f64,
}

/// Solar gain through an opaque roof (ISO 13790:2008 §11.3.4, eq. 45:
/// `A_sol = α R_se U A`), driven by the horizontal irradiance. Sky radiation is ignored.
#[derive(Debug, Clone, Copy, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RoofSolar {
    /// Roof area, m².
    pub area_m2: f64,
    /// Roof U-value, W/(m²K) (its U·A is part of `ua_opaque_w_k`).
    pub u_w_m2k: f64,
    /// Solar absorptance of the roof surface, 0..1 (default 0.6, a mid-grey roof: common
    /// practice).
    #[serde(default = "default_absorptance")]
    pub absorptance: f64,
}

fn default_absorptance() -> f64 {
    0.6
}
fn default_one() -> f64 {
    1.0
}
fn default_frame_fraction() -> f64 {
    0.25
}
fn default_room_height() -> f64 {
    3.0
}
fn default_sensible_pp() -> f64 {
    75.0
}
fn default_latent_pp() -> f64 {
    55.0
}
fn default_infiltration() -> f64 {
    0.3
}

/// The building for the 5R1C model (section `[load]` of a scenario).
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BuildingSpec {
    /// Conditioned floor area A_f, m².
    pub floor_area_m2: f64,
    /// Mean clear room height, m, for the infiltration volume (default 3.0, common practice).
    #[serde(default = "default_room_height")]
    pub room_height_m: f64,
    /// H_tr,op: U·A of the opaque envelope (walls, roof, floor), W/K.
    pub ua_opaque_w_k: f64,
    /// H_tr,w: U·A of the windows, W/K.
    pub ua_windows_w_k: f64,
    /// Window areas per orientation (frame included), m².
    #[serde(default)]
    pub windows: WindowAreas,
    /// Total solar energy transmittance of the glazing g_gl, 0..1, time-averaged for non-normal
    /// incidence (ISO 13790 §11.4.2: g_gl = F_w g_gl,n with F_w ≈ 0.9).
    pub g_value: f64,
    /// Shading reduction factor F_sh (external obstacles and movable shading), 0..1 (default 1:
    /// unshaded).
    #[serde(default = "default_one")]
    pub shading_factor: f64,
    /// Frame area fraction F_F of the window area, 0..0.9 (default 0.25, common practice).
    #[serde(default = "default_frame_fraction")]
    pub frame_fraction: f64,
    /// Optional solar gain through the roof; none by default.
    #[serde(default)]
    pub roof_solar: Option<RoofSolar>,
    /// Mass class of ISO 13790 Table 12.
    pub mass_class: MassClass,
    /// Peak internal sensible gains of lights and equipment, W per m² floor, scaled by the
    /// occupancy schedule.
    pub internal_gains_w_m2: f64,
    /// Internal sensible gains present every hour (stand-by equipment), W/m² (default 0).
    #[serde(default)]
    pub base_gains_w_m2: f64,
    /// Number of occupants at schedule fraction 1.
    pub occupants: f64,
    /// Sensible heat per occupant, W (default 75: "moderately active office work", ASHRAE
    /// Handbook—Fundamentals 2017 ch. 18 Table 1; from memory).
    #[serde(default = "default_sensible_pp")]
    pub sensible_w_per_person: f64,
    /// Latent heat per occupant, W (default 55, same row of the same table; from memory).
    #[serde(default = "default_latent_pp")]
    pub latent_w_per_person: f64,
    /// Outdoor air flow of the ventilation at schedule fraction 1, m³/h.
    pub ventilation_m3_h: f64,
    /// Infiltration, air changes per hour of A_f × room height, every hour (default 0.3,
    /// common practice).
    #[serde(default = "default_infiltration")]
    pub infiltration_ach: f64,
    /// Cooling set-point of the indoor air in occupied hours, °C.
    pub t_cool_setpoint_c: f64,
    /// Heating set-point of the indoor air in occupied hours, °C.
    pub t_heat_setpoint_c: f64,
    /// Cooling set-point in unoccupied hours (set-up), °C; absent = cooling off.
    #[serde(default)]
    pub t_cool_unoccupied_c: Option<f64>,
    /// Heating set-point in unoccupied hours (set-back), °C; absent = heating off.
    #[serde(default)]
    pub t_heat_unoccupied_c: Option<f64>,
    /// Indoor relative humidity the cooling plant holds, %.
    pub rh_setpoint_pct: f64,
    /// Occupancy schedule (fraction 0 = unoccupied).
    pub schedule: DaySchedule,
}

impl BuildingSpec {
    /// Range-check every key; keys are relative to the `[load]` section (`floor_area_m2`,
    /// `windows.south_m2`, `schedule.weekday[3]`). Also rejects combinations the 5R1C network
    /// cannot represent: H_tr,op ≥ H_tr,ms (no positive H_tr,em) and H_tr,w > h_ms (A_t − A_m)
    /// (a negative share of gains at the star node, eq. C.3).
    pub fn validate(&self) -> Result<()> {
        use validate::{in_range, positive};
        positive(
            "floor_area_m2",
            self.floor_area_m2,
            1e6,
            "conditioned floor area, m²",
        )?;
        in_range(
            "room_height_m",
            self.room_height_m,
            1.5,
            30.0,
            "mean room height, m",
        )?;
        positive(
            "ua_opaque_w_k",
            self.ua_opaque_w_k,
            1e7,
            "U·A of the opaque envelope, W/K",
        )?;
        in_range(
            "ua_windows_w_k",
            self.ua_windows_w_k,
            0.0,
            1e7,
            "U·A of the windows, W/K",
        )?;
        let w = &self.windows;
        for (k, v) in [
            ("windows.north_m2", w.north_m2),
            ("windows.east_m2", w.east_m2),
            ("windows.south_m2", w.south_m2),
            ("windows.west_m2", w.west_m2),
        ] {
            in_range(k, v, 0.0, 1e6, "window area incl. frame, m²")?;
        }
        in_range(
            "g_value",
            self.g_value,
            0.0,
            1.0,
            "total solar energy transmittance of the glazing",
        )?;
        in_range(
            "shading_factor",
            self.shading_factor,
            0.0,
            1.0,
            "shading reduction factor, 1 = unshaded",
        )?;
        in_range(
            "frame_fraction",
            self.frame_fraction,
            0.0,
            0.9,
            "frame share of the window area",
        )?;
        if let Some(r) = &self.roof_solar {
            in_range("roof_solar.area_m2", r.area_m2, 0.0, 1e6, "roof area, m²")?;
            in_range(
                "roof_solar.u_w_m2k",
                r.u_w_m2k,
                0.0,
                10.0,
                "roof U-value, W/(m²K)",
            )?;
            in_range(
                "roof_solar.absorptance",
                r.absorptance,
                0.0,
                1.0,
                "roof solar absorptance",
            )?;
        }
        in_range(
            "internal_gains_w_m2",
            self.internal_gains_w_m2,
            0.0,
            200.0,
            "peak lights and equipment gains, W/m²",
        )?;
        in_range(
            "base_gains_w_m2",
            self.base_gains_w_m2,
            0.0,
            200.0,
            "constant internal gains, W/m²",
        )?;
        in_range(
            "occupants",
            self.occupants,
            0.0,
            1e6,
            "number of occupants at full occupancy",
        )?;
        in_range(
            "sensible_w_per_person",
            self.sensible_w_per_person,
            0.0,
            500.0,
            "sensible heat per person, W",
        )?;
        in_range(
            "latent_w_per_person",
            self.latent_w_per_person,
            0.0,
            500.0,
            "latent heat per person, W",
        )?;
        in_range(
            "ventilation_m3_h",
            self.ventilation_m3_h,
            0.0,
            1e8,
            "outdoor air flow at full occupancy, m³/h",
        )?;
        in_range(
            "infiltration_ach",
            self.infiltration_ach,
            0.0,
            10.0,
            "infiltration, air changes per hour",
        )?;
        in_range(
            "t_heat_setpoint_c",
            self.t_heat_setpoint_c,
            5.0,
            30.0,
            "heating set-point, °C",
        )?;
        in_range(
            "t_cool_setpoint_c",
            self.t_cool_setpoint_c,
            15.0,
            35.0,
            "cooling set-point, °C",
        )?;
        if self.t_heat_setpoint_c > self.t_cool_setpoint_c {
            return Err(Error::input(
                "t_heat_setpoint_c",
                self.t_heat_setpoint_c,
                format!(
                    "must not exceed t_cool_setpoint_c = {} °C",
                    self.t_cool_setpoint_c
                ),
            ));
        }
        if let Some(t) = self.t_heat_unoccupied_c {
            in_range("t_heat_unoccupied_c", t, 0.0, 30.0, "heating set-back, °C")?;
        }
        if let Some(t) = self.t_cool_unoccupied_c {
            in_range("t_cool_unoccupied_c", t, 15.0, 45.0, "cooling set-up, °C")?;
        }
        if let (Some(h), Some(c)) = (self.t_heat_unoccupied_c, self.t_cool_unoccupied_c)
            && h > c
        {
            return Err(Error::input(
                "t_heat_unoccupied_c",
                h,
                format!("must not exceed t_cool_unoccupied_c = {c} °C"),
            ));
        }
        in_range(
            "rh_setpoint_pct",
            self.rh_setpoint_pct,
            20.0,
            80.0,
            "indoor relative humidity, %",
        )?;
        self.schedule
            .validate()
            .map_err(|e| e.within("", "schedule"))?;
        Network::from_spec(self).map(|_| ())
    }

    /// Effective solar collecting areas `A_sol` for the N, E, S, W and horizontal irradiance,
    /// m²: windows `F_sh g (1 − F_F) A_w` (ISO 13790:2008 eq. 44), roof `α R_se U A` (eq. 45).
    pub fn solar_areas_m2(&self) -> [f64; 5] {
        let f = self.shading_factor * self.g_value * (1.0 - self.frame_fraction);
        let w = &self.windows;
        let roof = self
            .roof_solar
            .map_or(0.0, |r| r.absorptance * R_SE_M2K_W * r.u_w_m2k * r.area_m2);
        [
            f * w.north_m2,
            f * w.east_m2,
            f * w.south_m2,
            f * w.west_m2,
            roof,
        ]
    }
}

/// The constant part of the 5R1C network: areas, conductances and heat capacity.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Network {
    /// Conditioned floor area A_f, m².
    pub a_f_m2: f64,
    /// Effective mass area A_m, m².
    pub a_m_m2: f64,
    /// Area of all surfaces facing the zone A_t = 4.5 A_f, m².
    pub a_t_m2: f64,
    /// Internal heat capacity C_m, J/K.
    pub c_m_j_k: f64,
    /// H_tr,is = h_is A_t, W/K.
    pub h_tr_is_w_k: f64,
    /// H_tr,w, W/K.
    pub h_tr_w_w_k: f64,
    /// H_tr,ms = h_ms A_m, W/K.
    pub h_tr_ms_w_k: f64,
    /// H_tr,em, W/K, from `1/H_tr,em = 1/H_tr,op − 1/H_tr,ms`.
    pub h_tr_em_w_k: f64,
}

impl Network {
    /// Build the network of a zone.
    ///
    /// * `a_f_m2` – conditioned floor area, m² (> 0)
    /// * `mass` – mass class (Table 12 gives A_m and C_m per A_f)
    /// * `ua_opaque_w_k` – H_tr,op, W/K (> 0 and below H_tr,ms = 9.1 A_m)
    /// * `ua_windows_w_k` – H_tr,w, W/K (≥ 0 and at most 9.1 (A_t − A_m), so that the star
    ///   node's gain share of eq. C.3 is not negative)
    ///
    /// `A_t = 4.5 A_f`, `H_tr,is = 3.45 A_t`, `H_tr,ms = 9.1 A_m`,
    /// `H_tr,em = 1 / (1/H_tr,op − 1/H_tr,ms)` (ISO 13790:2008 eqs. 9, 63, 64; from memory).
    /// Returns an `Input` error (key `ua_opaque_w_k` or `ua_windows_w_k`) outside those limits.
    pub fn new(
        a_f_m2: f64,
        mass: MassClass,
        ua_opaque_w_k: f64,
        ua_windows_w_k: f64,
    ) -> Result<Network> {
        validate::positive("floor_area_m2", a_f_m2, 1e6, "conditioned floor area, m²")?;
        let (am_per_af, cm_per_af) = mass.per_floor_area();
        let a_m = am_per_af * a_f_m2;
        let a_t = LAMBDA_AT * a_f_m2;
        let h_ms = H_MS_W_M2K * a_m;
        if !(ua_opaque_w_k.is_finite() && ua_opaque_w_k > 0.0 && ua_opaque_w_k < h_ms) {
            return Err(Error::input(
                "ua_opaque_w_k",
                ua_opaque_w_k,
                format!(
                    "must be > 0 and below H_tr,ms = 9.1 W/m²K × A_m = {h_ms:.1} W/K for a \
                     {}-mass building of {a_f_m2} m² (ISO 13790 5R1C network)",
                    mass.name()
                ),
            ));
        }
        let h_w_max = H_MS_W_M2K * (a_t - a_m);
        if !(ua_windows_w_k.is_finite() && (0.0..=h_w_max).contains(&ua_windows_w_k)) {
            return Err(Error::input(
                "ua_windows_w_k",
                ua_windows_w_k,
                format!(
                    "must be between 0 and 9.1 W/m²K × (A_t − A_m) = {h_w_max:.1} W/K for this \
                     floor area and mass class (ISO 13790 eq. C.3 gain split)"
                ),
            ));
        }
        Ok(Network {
            a_f_m2,
            a_m_m2: a_m,
            a_t_m2: a_t,
            c_m_j_k: cm_per_af * a_f_m2,
            h_tr_is_w_k: H_IS_W_M2K * a_t,
            h_tr_w_w_k: ua_windows_w_k,
            h_tr_ms_w_k: h_ms,
            h_tr_em_w_k: 1.0 / (1.0 / ua_opaque_w_k - 1.0 / h_ms),
        })
    }

    /// The network of a building spec (see [`Network::new`]).
    pub fn from_spec(spec: &BuildingSpec) -> Result<Network> {
        Network::new(
            spec.floor_area_m2,
            spec.mass_class,
            spec.ua_opaque_w_k,
            spec.ua_windows_w_k,
        )
    }

    /// Steady-state conductance from the indoor air node to outdoors, W/K, when θ_sup = θ_e:
    /// `H_ve + 1 / (1/H_tr,is + 1/(H_tr,w + H_tr,op))`, with `H_tr,op` the series combination
    /// of H_tr,ms and H_tr,em. With no gains and a constant set-point the need settles to
    /// this times `(θ_set − θ_e)`.
    pub fn steady_conductance_w_k(&self, h_ve_w_k: f64) -> f64 {
        let h_op = 1.0 / (1.0 / self.h_tr_ms_w_k + 1.0 / self.h_tr_em_w_k);
        h_ve_w_k + 1.0 / (1.0 / self.h_tr_is_w_k + 1.0 / (self.h_tr_w_w_k + h_op))
    }
}

/// What drives one hour of the network.
#[derive(Debug, Clone, Copy)]
pub struct HourDrive {
    /// Outdoor air θ_e, °C.
    pub t_e_c: f64,
    /// Supply air θ_sup, °C (θ_e without heat recovery).
    pub t_sup_c: f64,
    /// Ventilation and infiltration conductance H_ve, W/K (≥ 0).
    pub h_ve_w_k: f64,
    /// Internal heat gains Φ_int, W.
    pub phi_int_w: f64,
    /// Solar heat gains Φ_sol, W.
    pub phi_sol_w: f64,
    /// Heating set-point of the air, °C (`f64::NEG_INFINITY` = heating off).
    pub t_heat_set_c: f64,
    /// Cooling set-point of the air, °C (`f64::INFINITY` = cooling off).
    pub t_cool_set_c: f64,
}

/// Result of one hour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StepResult {
    /// Heating (+) or cooling (−) need Φ_HC,nd delivered to the air node, W.
    pub phi_hc_w: f64,
    /// Air temperature θ_air, °C.
    pub t_air_c: f64,
    /// Star (surface) temperature θ_s, °C.
    pub t_s_c: f64,
    /// Mass temperature averaged over the hour θ_m (eq. C.9), °C.
    pub t_m_c: f64,
    /// Mass temperature at the end of the hour θ_m,t (eq. C.4), °C.
    pub t_m_end_c: f64,
    /// Operative temperature `0.3 θ_air + 0.7 θ_s` (eq. C.12), °C.
    pub t_op_c: f64,
}

/// Gains split to the air, star and mass nodes (eqs. C.1–C.3), W:
/// `Φ_ia = 0.5 Φ_int`, `Φ_m = (A_m/A_t)(0.5 Φ_int + Φ_sol)`,
/// `Φ_st = (1 − A_m/A_t − H_tr,w/(9.1 A_t))(0.5 Φ_int + Φ_sol)`.
///
/// The share `H_tr,w / (9.1 A_t)` of `0.5 Φ_int + Φ_sol` goes to no node: the standard's split
/// treats it as lost through the windows, so the three shares sum to less than the gains when
/// H_tr,w > 0.
pub fn split_gains(net: &Network, phi_int_w: f64, phi_sol_w: f64) -> (f64, f64, f64) {
    let half = 0.5 * phi_int_w + phi_sol_w;
    let r_m = net.a_m_m2 / net.a_t_m2;
    let phi_ia = 0.5 * phi_int_w;
    let phi_m = r_m * half;
    let phi_st = (1.0 - r_m - net.h_tr_w_w_k / (H_MS_W_M2K * net.a_t_m2)) * half;
    (phi_ia, phi_st, phi_m)
}

/// The hour's combined conductances (eqs. C.6–C.8) and the reciprocals the node equations
/// divide by, computed once per hour and shared by the three solutions of [`step`].
/// Written so that H_ve = 0 (and H_tr,w = 0) need no division by zero:
/// `H_tr,1 / H_ve = H_tr,is / (H_ve + H_tr,is)`, `H_tr,3 / H_tr,2 = H_tr,ms / (H_tr,2 + H_tr,ms)`.
struct Coeffs {
    h1: f64,
    k_is: f64,
    k_ms: f64,
    c_minus_g: f64,
    inv_c_plus_g: f64,
    inv_star: f64,
    inv_air: f64,
}

#[inline]
fn coeffs(net: &Network, h_ve: f64) -> Coeffs {
    let h_is = net.h_tr_is_w_k;
    let h_ms = net.h_tr_ms_w_k;
    let inv_ve_is = 1.0 / (h_ve + h_is);
    let h1 = h_ve * h_is * inv_ve_is; // C.6
    let h2 = h1 + net.h_tr_w_w_k; // C.7
    let k_ms = h_ms / (h2 + h_ms); // H_tr,3 / H_tr,2
    let h3 = h2 * k_ms; // C.8
    let c = net.c_m_j_k / 3600.0;
    let g = 0.5 * (h3 + net.h_tr_em_w_k);
    Coeffs {
        h1,
        k_is: h_is * inv_ve_is,
        k_ms,
        c_minus_g: c - g,
        inv_c_plus_g: 1.0 / (c + g),
        inv_star: 1.0 / (h_ms + net.h_tr_w_w_k + h1),
        inv_air: inv_ve_is,
    }
}

/// Node temperatures for a given Φ_HC (eqs. C.4, C.5, C.9–C.12; Crank–Nicolson on the mass).
#[inline]
fn solve(
    net: &Network,
    k: &Coeffs,
    t_m_prev_c: f64,
    d: &HourDrive,
    gains: (f64, f64, f64),
    phi_hc_w: f64,
) -> StepResult {
    let (phi_ia, phi_st, phi_m) = gains;
    let h_w = net.h_tr_w_w_k;
    // Terms at the star node from the air side and windows:
    // Φ_st + H_tr,w θ_e + H_tr,1 (θ_sup + (Φ_ia + Φ_HC)/H_ve).
    let star_src = phi_st + h_w * d.t_e_c + k.h1 * d.t_sup_c + k.k_is * (phi_ia + phi_hc_w);
    let phi_mtot = phi_m + net.h_tr_em_w_k * d.t_e_c + k.k_ms * star_src; // C.5
    let t_m_end = (t_m_prev_c * k.c_minus_g + phi_mtot) * k.inv_c_plus_g; // C.4
    let t_m = 0.5 * (t_m_end + t_m_prev_c); // C.9
    let t_s = (net.h_tr_ms_w_k * t_m + star_src) * k.inv_star; // C.10
    let t_air = (net.h_tr_is_w_k * t_s + d.h_ve_w_k * d.t_sup_c + phi_ia + phi_hc_w) * k.inv_air; // C.11
    StepResult {
        phi_hc_w,
        t_air_c: t_air,
        t_s_c: t_s,
        t_m_c: t_m,
        t_m_end_c: t_m_end,
        t_op_c: 0.3 * t_air + 0.7 * t_s, // C.12
    }
}

/// One hour of the 5R1C network with ideal (unlimited) heating and cooling.
///
/// * `net` – the zone's network
/// * `t_m_prev_c` – mass temperature θ_m,t−1 at the start of the hour, °C
/// * `d` – the hour's outdoor and supply temperature, H_ve, gains and set-points
///
/// ISO 13790:2008 §C.4.2: (1) free-floating, Φ_HC,nd = 0: if `θ_H,set ≤ θ_air,0 ≤ θ_C,set`
/// the need is zero; (2) otherwise with `Φ_HC,nd,10 = 10 W/m² · A_f` the unrestricted need is
/// `Φ_HC,nd,un = Φ_HC,nd,10 (θ_air,set − θ_air,0) / (θ_air,10 − θ_air,0)` (eq. C.13), with
/// θ_air,set the violated set-point; (3) the hour is solved again with that need, so the air
/// ends exactly at the set-point. Capacity limits (steps 4–5) are not applied.
/// Returns the need (heating +, cooling −, W) and the node temperatures. Non-finite drive
/// values propagate as NaN; [`simulate`] validates its inputs first.
pub fn step(net: &Network, t_m_prev_c: f64, d: &HourDrive) -> StepResult {
    let gains = split_gains(net, d.phi_int_w, d.phi_sol_w);
    let k = coeffs(net, d.h_ve_w_k);
    let free = solve(net, &k, t_m_prev_c, d, gains, 0.0);
    let t0 = free.t_air_c;
    let t_set = if t0 < d.t_heat_set_c {
        d.t_heat_set_c
    } else if t0 > d.t_cool_set_c {
        d.t_cool_set_c
    } else {
        return free;
    };
    let phi10 = PHI_TEST_W_M2 * net.a_f_m2;
    let t10 = solve(net, &k, t_m_prev_c, d, gains, phi10).t_air_c;
    let phi_un = phi10 * (t_set - t0) / (t10 - t0); // C.13
    solve(net, &k, t_m_prev_c, d, gains, phi_un)
}

/// Latent cooling load of one hour, W (≥ 0).
///
/// `q_l = ρ V̇ (W_out − W_in) h_fg + N q_lat`, clipped at 0: the plant dehumidifies but never
/// humidifies, so dry outdoor air that outweighs the occupants' moisture gives 0.
///
/// * `air_m3_h` – outdoor air entering (ventilation + infiltration), m³/h
/// * `w_out_kg_kg`, `w_in_kg_kg` – outdoor and indoor humidity ratio, kg/kg
/// * `people` – occupants present (occupants × schedule fraction)
/// * `latent_w_per_person` – latent heat per occupant, W
///
/// ρ = 1.204 kg/m³, h_fg = 2501 kJ/kg, i.e. 3011 W per (L/s · kg/kg), against the rounded
/// 3010 of ASHRAE Handbook—Fundamentals 2017 ch. 18 (`q_l = 3010 Q ΔW`, Q in L/s; from memory).
pub fn latent_w(
    air_m3_h: f64,
    w_out_kg_kg: f64,
    w_in_kg_kg: f64,
    people: f64,
    latent_w_per_person: f64,
) -> f64 {
    let vent = RHO_AIR_KG_M3 * air_m3_h / 3600.0 * (w_out_kg_kg - w_in_kg_kg) * H_FG_J_KG;
    (vent + people * latent_w_per_person).max(0.0)
}

/// Indoor humidity ratio the cooling plant holds, kg/kg: the humidity ratio of air at
/// `t_cool_setpoint_c` and `rh_setpoint_pct`, `W = 0.621945 φ p_ws / (p − φ p_ws)` (ASHRAE
/// Handbook—Fundamentals 2017 ch. 1 eqs. 20, 22, via `props::psychro::ratio_from_rh`).
///
/// * `p_kpa` – barometric pressure at the site, kPa
///
/// Example: 26 °C, 50 % at 101.325 kPa gives about 0.0105 kg/kg. Errors from the psychrometric
/// routines (pressure or temperature outside their range) pass through.
pub fn indoor_humidity_ratio(spec: &BuildingSpec, p_kpa: f64) -> Result<f64> {
    crate::props::psychro::ratio_from_rh(spec.t_cool_setpoint_c, spec.rh_setpoint_pct, p_kpa)
}

/// Hours of warm-up before the year: the last 30 days of the year are run first, starting the
/// mass at the mean of the occupied set-points (common practice: a cyclic warm-up).
const WARMUP_HOURS: usize = 720;

/// What the building sees in one hour (gains, ventilation, set-points), from spec and input.
#[inline]
fn drive(
    spec: &BuildingSpec,
    a_sol: &[f64; 5],
    volume_m3: f64,
    inp: &BuildingHourInput,
) -> (HourDrive, f64, f64) {
    let f = spec.schedule.at(inp.hour_of_day, inp.weekday);
    let occupied = f > 0.0;
    let a_f = spec.floor_area_m2;
    let phi_int = (spec.internal_gains_w_m2 * f + spec.base_gains_w_m2) * a_f
        + spec.occupants * f * spec.sensible_w_per_person;
    let phi_sol: f64 = a_sol
        .iter()
        .zip(inp.solar_w_m2.iter())
        .map(|(a, i)| a * i)
        .sum();
    let air_m3_h = spec.ventilation_m3_h * f + spec.infiltration_ach * volume_m3;
    let (t_h, t_c) = if occupied {
        (spec.t_heat_setpoint_c, spec.t_cool_setpoint_c)
    } else {
        (
            spec.t_heat_unoccupied_c.unwrap_or(f64::NEG_INFINITY),
            spec.t_cool_unoccupied_c.unwrap_or(f64::INFINITY),
        )
    };
    (
        HourDrive {
            t_e_c: inp.t_out_c,
            t_sup_c: inp.t_out_c,
            h_ve_w_k: RHO_C_AIR_J_M3K * air_m3_h / 3600.0,
            phi_int_w: phi_int,
            phi_sol_w: phi_sol,
            t_heat_set_c: t_h,
            t_cool_set_c: t_c,
        },
        air_m3_h,
        f,
    )
}

/// Run the year with the 5R1C model.
///
/// * `spec` – the building (validated here)
/// * `inputs` – 8760 hours: outdoor dry-bulb °C, humidity ratio kg/kg, irradiance on the N, E,
///   S, W vertical and the horizontal plane W/m², hour of day, weekday
/// * `w_in_kg_kg` – indoor humidity ratio the plant holds when cooling, kg/kg (the caller
///   computes it from `t_cool_setpoint_c` and `rh_setpoint_pct` at the site pressure)
///
/// Per hour: internal gains `(q_int f + q_base) A_f + N f q_sens` (f the schedule fraction),
/// solar `Σ A_sol,k I_k` ([`BuildingSpec::solar_areas_m2`]), air flow `V̇_vent f + n_inf A_f h`,
/// `H_ve = 1200 V̇ / 3600`, set-points of occupied (f > 0) or unoccupied hours; then [`step`].
/// Output: `sensible_kw` the cooling need (≥ 0), `heating_kw` the heating need (≥ 0),
/// `t_in_c` the air temperature, `latent_kw` from [`latent_w`] in hours when cooling is
/// available (a finite cooling set-point), else 0, `ventilation_m3_h` the mechanical
/// ventilation `V̇_vent f` (infiltration excluded; 0 in unoccupied hours). The mass starts from a 720-hour warm-up
/// over the last 30 days of the year.
///
/// Errors: invalid spec, not 8760 inputs, non-finite or negative input values (key
/// `hour N.field`), `w_in_kg_kg` outside 0..0.05.
pub fn simulate(
    spec: &BuildingSpec,
    inputs: &[BuildingHourInput],
    w_in_kg_kg: f64,
) -> Result<LoadYear> {
    spec.validate()?;
    if inputs.len() != HOURS {
        return Err(Error::input(
            "inputs",
            format!("{} hours", inputs.len()),
            format!("must be exactly {HOURS} hours"),
        ));
    }
    validate::in_range(
        "w_in_kg_kg",
        w_in_kg_kg,
        0.0,
        0.05,
        "indoor humidity ratio, kg/kg",
    )?;
    // Range-check every hour; the key is only formatted for a failing value (no allocation
    // per hour).
    let check = |i: usize, name: &str, v: f64, lo: f64, hi: f64, meaning: &str| -> Result<()> {
        if v.is_finite() && (lo..=hi).contains(&v) {
            Ok(())
        } else {
            validate::in_range(&format!("hour {i}.{name}"), v, lo, hi, meaning)
        }
    };
    for (i, inp) in inputs.iter().enumerate() {
        check(
            i,
            "t_out_c",
            inp.t_out_c,
            -80.0,
            70.0,
            "outdoor dry-bulb, °C",
        )?;
        check(
            i,
            "w_out_kg_kg",
            inp.w_out_kg_kg,
            0.0,
            0.2,
            "outdoor humidity ratio, kg/kg",
        )?;
        for (k, s) in inp.solar_w_m2.iter().enumerate() {
            check(
                i,
                [
                    "solar_w_m2[0]",
                    "solar_w_m2[1]",
                    "solar_w_m2[2]",
                    "solar_w_m2[3]",
                    "solar_w_m2[4]",
                ][k],
                *s,
                0.0,
                2000.0,
                "irradiance on N, E, S, W, horizontal, W/m²",
            )?;
        }
    }
    let net = Network::from_spec(spec)?;
    let a_sol = spec.solar_areas_m2();
    let volume = spec.floor_area_m2 * spec.room_height_m;
    let mut t_m = 0.5 * (spec.t_heat_setpoint_c + spec.t_cool_setpoint_c);
    for inp in &inputs[HOURS - WARMUP_HOURS..] {
        let (d, _, _) = drive(spec, &a_sol, volume, inp);
        t_m = step(&net, t_m, &d).t_m_end_c;
    }
    let mut hours = Vec::with_capacity(HOURS);
    for inp in inputs {
        let (d, air_m3_h, f) = drive(spec, &a_sol, volume, inp);
        let r = step(&net, t_m, &d);
        t_m = r.t_m_end_c;
        let latent = if d.t_cool_set_c.is_finite() {
            latent_w(
                air_m3_h,
                inp.w_out_kg_kg,
                w_in_kg_kg,
                spec.occupants * f,
                spec.latent_w_per_person,
            )
        } else {
            0.0
        };
        hours.push(LoadHour {
            sensible_kw: (-r.phi_hc_w).max(0.0) / 1000.0,
            latent_kw: latent / 1000.0,
            heating_kw: r.phi_hc_w.max(0.0) / 1000.0,
            t_in_c: r.t_air_c,
            // The mechanical ventilation only (schedule fraction × design flow), not the
            // infiltration: the part of `air_m3_h` an outdoor-air unit can replace.
            ventilation_m3_h: spec.ventilation_m3_h * f,
        });
    }
    Ok(LoadYear {
        hours,
        origin: "ISO 13790 5R1C model".to_string(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::load::schedule;

    /// A demo office: 500 m², medium mass (demo values, typical of the class).
    fn office() -> BuildingSpec {
        toml::from_str(
            r#"
            floor_area_m2 = 500.0
            ua_opaque_w_k = 250.0
            ua_windows_w_k = 240.0
            windows = { north_m2 = 20.0, east_m2 = 25.0, south_m2 = 40.0, west_m2 = 25.0 }
            g_value = 0.5
            mass_class = "medium"
            internal_gains_w_m2 = 15.0
            occupants = 40.0
            ventilation_m3_h = 1500.0
            t_cool_setpoint_c = 26.0
            t_heat_setpoint_c = 20.0
            rh_setpoint_pct = 50.0
            schedule = { weekday = [0,0,0,0,0,0,0,0,1,1,1,1,1,1,1,1,1,1,0,0,0,0,0,0], weekend = [0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0,0] }
            "#,
        )
        .unwrap()
    }

    fn year(f: impl Fn(usize) -> BuildingHourInput) -> Vec<BuildingHourInput> {
        (0..HOURS).map(f).collect()
    }

    fn calm(i: usize, t_out_c: f64, w_out_kg_kg: f64) -> BuildingHourInput {
        BuildingHourInput {
            t_out_c,
            w_out_kg_kg,
            solar_w_m2: [0.0; 5],
            hour_of_day: (i % 24) as u32,
            // 1 January taken as a Monday.
            weekday: ((i / 24) % 7) as u32,
        }
    }

    #[test]
    fn spec_defaults_and_validates() {
        let s = office();
        s.validate().unwrap();
        assert_eq!(s.shading_factor, 1.0);
        assert_eq!(s.frame_fraction, 0.25);
        assert_eq!(s.sensible_w_per_person, 75.0);
        assert_eq!(s.latent_w_per_person, 55.0);
        assert_eq!(s.infiltration_ach, 0.3);
        assert!(s.t_cool_unoccupied_c.is_none());
        // A_sol south = F_sh g (1 − F_F) A_w = 1 × 0.5 × 0.75 × 40 = 15 m² (ISO 13790 eq. 44).
        assert!((s.solar_areas_m2()[2] - 15.0).abs() < 1e-12);
    }

    #[test]
    fn mass_class_names_deserialize() {
        #[derive(serde::Deserialize)]
        struct W {
            m: MassClass,
        }
        let w: W = toml::from_str("m = \"very-heavy\"").unwrap();
        assert_eq!(w.m, MassClass::VeryHeavy);
        assert!(toml::from_str::<W>("m = \"concrete\"").is_err());
    }

    #[test]
    fn network_medium_office() {
        // A_f = 100 m², medium: A_m = 250 m², A_t = 450 m², C_m = 16.5 MJ/K,
        // H_tr,is = 3.45 × 450 = 1552.5 W/K, H_tr,ms = 9.1 × 250 = 2275 W/K,
        // H_tr,em = 1/(1/60 − 1/2275) = 61.62528 W/K (ISO 13790:2008 Table 12, eqs. 9, 63, 64).
        let n = Network::new(100.0, MassClass::Medium, 60.0, 40.0).unwrap();
        assert_eq!(n.a_m_m2, 250.0);
        assert_eq!(n.a_t_m2, 450.0);
        assert_eq!(n.c_m_j_k, 16.5e6);
        assert!((n.h_tr_is_w_k - 1552.5).abs() < 1e-9);
        assert!((n.h_tr_ms_w_k - 2275.0).abs() < 1e-9);
        assert!((n.h_tr_em_w_k - 61.625_282_167).abs() < 1e-6);
    }

    #[test]
    fn validation_errors_name_the_key() {
        let mut s = office();
        s.floor_area_m2 = -10.0;
        let e = s.validate().unwrap_err().to_string();
        assert!(e.contains("floor_area_m2 = -10"), "{e}");

        let mut s = office();
        s.g_value = 1.2;
        let e = s.validate().unwrap_err().to_string();
        assert!(
            e.contains("g_value = 1.2") && e.contains("between 0 and 1"),
            "{e}"
        );

        let mut s = office();
        s.schedule.weekday.truncate(23);
        let e = s.validate().unwrap_err().to_string();
        assert!(
            e.contains("schedule.weekday") && e.contains("exactly 24"),
            "{e}"
        );

        let mut s = office();
        s.t_heat_setpoint_c = 27.0;
        assert!(
            s.validate()
                .unwrap_err()
                .to_string()
                .contains("t_heat_setpoint_c")
        );

        // H_tr,op above H_tr,ms = 9.1 × 2.5 × 500 = 11 375 W/K cannot be split.
        let mut s = office();
        s.ua_opaque_w_k = 12_000.0;
        let e = s.validate().unwrap_err().to_string();
        assert!(e.contains("ua_opaque_w_k") && e.contains("11375"), "{e}");

        let mut s = office();
        s.windows.south_m2 = f64::NAN;
        assert!(
            s.validate()
                .unwrap_err()
                .to_string()
                .contains("windows.south_m2")
        );
    }

    #[test]
    fn unknown_key_rejected() {
        let text = "floor_area_m2 = 1.0\nfloor_aera = 2.0";
        assert!(toml::from_str::<BuildingSpec>(text).is_err());
    }

    #[test]
    fn simulate_rejects_bad_inputs() {
        let s = office();
        let short: Vec<_> = (0..8759).map(|i| calm(i, 20.0, 0.008)).collect();
        let e = simulate(&s, &short, 0.0093).unwrap_err().to_string();
        assert!(e.contains("8759") && e.contains("8760"), "{e}");
        let mut y = year(|i| calm(i, 20.0, 0.008));
        y[100].solar_w_m2[2] = f64::NAN;
        let e = simulate(&s, &y, 0.0093).unwrap_err().to_string();
        assert!(e.contains("hour 100.solar_w_m2[2]"), "{e}");
        let y = year(|i| calm(i, 20.0, 0.008));
        assert!(simulate(&s, &y, -0.1).is_err());
    }

    /// Constant 35 °C outdoors, no sun, no gains, set-point 26 °C day and night: every hour the
    /// sensible load is the network's steady conductance × 9 K (warm-up has settled the mass).
    #[test]
    fn constant_weather_gives_steady_load() {
        let mut s = office();
        s.internal_gains_w_m2 = 0.0;
        s.occupants = 0.0;
        s.schedule = DaySchedule {
            weekday: vec![1.0; 24],
            weekend: vec![1.0; 24],
        };
        let y = year(|i| calm(i, 35.0, 0.008));
        let out = simulate(&s, &y, 0.0093).unwrap();
        let net = Network::from_spec(&s).unwrap();
        let air_m3_h = 1500.0 + 0.3 * 500.0 * 3.0;
        let h_ve = 1200.0 * air_m3_h / 3600.0;
        let expect_kw = net.steady_conductance_w_k(h_ve) * 9.0 / 1000.0;
        for h in [0, 4000, 8759] {
            let l = out.hours[h];
            assert!(
                (l.sensible_kw - expect_kw).abs() < 1e-6 * expect_kw,
                "{l:?} vs {expect_kw}"
            );
            assert_eq!(l.heating_kw, 0.0);
            assert!((l.t_in_c - 26.0).abs() < 1e-9);
            // Drier outdoor air (0.008 < 0.0093) and no people: no latent load.
            assert_eq!(l.latent_kw, 0.0);
        }
    }

    /// Office in a humid, warm year: latent load only while cooling is available (office
    /// hours), equal to ρ V̇ ΔW h_fg + N q_lat; no cooling at night (cooling off unoccupied).
    #[test]
    fn office_latent_and_schedule() {
        let s = office();
        let y = year(|i| calm(i, 30.0, 0.016));
        let out = simulate(&s, &y, 0.0093).unwrap();
        // Monday 10:00 (hour 10): occupied.
        let day = out.hours[10];
        let air = 1500.0 + 0.3 * 500.0 * 3.0;
        let expect_w = 1.204 * air / 3600.0 * (0.016 - 0.0093) * 2.501e6 + 40.0 * 55.0;
        assert!((day.latent_kw * 1000.0 - expect_w).abs() < 1e-6, "{day:?}");
        assert!(day.sensible_kw > 0.0);
        assert!((day.t_in_c - 26.0).abs() < 1e-9);
        // Mechanical ventilation reaches the route: 1500 m³/h × fraction 1, infiltration
        // (450 m³/h) not included.
        assert_eq!(day.ventilation_m3_h, 1500.0);
        // Monday 02:00: cooling off, free-floating, no loads.
        let night = out.hours[2];
        assert_eq!(night.ventilation_m3_h, 0.0);
        assert_eq!(
            (night.sensible_kw, night.latent_kw, night.heating_kw),
            (0.0, 0.0, 0.0)
        );
        assert!(night.t_in_c > 26.0, "{night:?}");
        // Saturday 10:00 (day 5): unoccupied.
        assert_eq!(out.hours[5 * 24 + 10].sensible_kw, 0.0);
    }

    #[test]
    fn winter_heating_with_setback() {
        let mut s = office();
        s.t_heat_unoccupied_c = Some(15.0);
        let y = year(|i| calm(i, -5.0, 0.002));
        let out = simulate(&s, &y, 0.0093).unwrap();
        let day = out.hours[10];
        assert!(day.heating_kw > 0.0 && day.sensible_kw == 0.0 && day.latent_kw == 0.0);
        assert!((day.t_in_c - 20.0).abs() < 1e-9);
        // Night: set-back holds 15 °C.
        let night = out.hours[3];
        assert!(night.heating_kw > 0.0);
        assert!((night.t_in_c - 15.0).abs() < 1e-9);
        assert!(night.heating_kw < day.heating_kw);
    }

    /// Sun through south windows adds a cooling load: 40 m² × 0.5 × 0.75 × 500 W/m² = 7.5 kW of
    /// gains; the extra hourly cooling is positive and below the gain (part is stored).
    #[test]
    fn solar_gain_raises_cooling() {
        let s = office();
        let dark = simulate(&s, &year(|i| calm(i, 30.0, 0.01)), 0.0093).unwrap();
        let sunny = simulate(
            &s,
            &year(|i| {
                let mut h = calm(i, 30.0, 0.01);
                if (9..15).contains(&(i % 24)) {
                    h.solar_w_m2[2] = 500.0;
                }
                h
            }),
            0.0093,
        )
        .unwrap();
        let extra = sunny.hours[12].sensible_kw - dark.hours[12].sensible_kw;
        assert!(extra > 0.0 && extra < 7.5, "extra {extra} kW");
    }

    /// 8760 hours of the 5R1C model; prints the time (debug build here; the brief asks for
    /// well under 1 ms in release).
    #[test]
    fn year_is_fast() {
        let s = office();
        let y = year(|i| calm(i, 20.0 + 10.0 * ((i % 24) as f64 / 24.0), 0.01));
        let t = std::time::Instant::now();
        let out = simulate(&s, &y, 0.0093).unwrap();
        let dt = t.elapsed();
        eprintln!("5R1C year: {dt:?}");
        assert_eq!(out.hours.len(), HOURS);
        assert!(out.hours.iter().all(|h| h.t_in_c.is_finite()));
    }

    /// 26 °C, 50 % RH, 101.325 kPa: p_ws = 3.3629 kPa (ASHRAE Fundamentals 2017 ch. 1 Table 3,
    /// from memory), p_w = 1.6815 kPa, W = 0.621945 × 1.6815 / (101.325 − 1.6815) = 0.010495.
    #[test]
    fn indoor_ratio_at_setpoint() {
        let w = indoor_humidity_ratio(&office(), 101.325).unwrap();
        assert!((w - 0.010495).abs() < 2e-5, "{w}");
    }

    #[test]
    fn demo_schedules_fit() {
        let mut s = office();
        s.schedule = schedule::clinic();
        s.validate().unwrap();
    }
}
