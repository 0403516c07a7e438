//! Phase-change store, lumped, enthalpy method.
//!
//! The state is the store's specific enthalpy `h` (J/kg), zero for solid at the solidus
//! `T1 = t_melt − r/2` (`r` = melt range). Temperature follows from `h` piecewise:
//!
//! * solid, `h ≤ 0`: `T = T1 + h/cs`
//! * mushy, `0 < h < hL`: liquid fraction `f` rises linearly with `T` from `T1` to
//!   `T2 = t_melt + r/2`; `h = λ f + cs (T − T1) + (cl − cs)(T − T1)²/(2r)` (the sensible part
//!   uses the fraction-weighted heat capacity `cs (1 − f) + cl f`)
//! * liquid, `h ≥ hL = λ + (cs + cl) r/2`: `T = T2 + (h − hL)/cl`
//!
//! With `r = 0` the melt is isothermal at `t_melt` and `f = h/λ`. Across the whole transition
//! from `Ta < T1` to `Tb > T2` the heat is `m [cs (t_melt − Ta) + λ + cl (Tb − t_melt)]`, the
//! textbook form `Q = m [cs (T* − T1) + λ + cl (T2 − T*)]`.
//!
//! Source: enthalpy method for phase change, e.g. Mehling & Cabeza, Heat and cold storage with
//! PCM, Springer 2008, ch. 1–2 (sensible + latent heat of a PCM); Duffie & Beckman, Solar
//! Engineering of Thermal Processes, 4th ed., ch. 8 (phase-change energy storage; section from memory).

use crate::error::Result;
use crate::validate::{in_range, positive};

/// A phase-change store.
#[derive(Debug, Clone)]
pub struct PcmSpec {
    /// PCM mass, kg.
    pub mass_kg: f64,
    /// Specific heat of the solid, J/(kg·K).
    pub cp_solid_j_kgk: f64,
    /// Specific heat of the liquid, J/(kg·K).
    pub cp_liquid_j_kgk: f64,
    /// Latent heat of melting, J/kg.
    pub latent_j_kg: f64,
    /// Melting temperature (middle of the melt range), °C.
    pub t_melt_c: f64,
    /// Width of the melt range, K (≥ 0; 0 = isothermal melt).
    pub melt_range_k: f64,
    /// Loss coefficient to the room, W/K.
    pub ua_loss_w_k: f64,
    /// Fluid-to-PCM exchanger UA, W/K.
    pub ua_hx_w_k: f64,
    /// Start temperature, °C.
    pub t_init_c: f64,
}

impl PcmSpec {
    /// Demo values typical of an organic paraffin melting near 58 °C (not any product):
    /// λ = 180 kJ/kg, cs = 2.0 and cl = 2.2 kJ/(kg·K), 2 K melt range; 1000 kg, UA loss 3 W/K,
    /// exchanger UA 800 W/K. Paraffins: λ ≈ 150–250 kJ/kg and cp ≈ 2 kJ/(kg·K) per Mehling &
    /// Cabeza, Heat and cold storage with PCM, Springer 2008, ch. 2 (from memory); the rest is
    /// typical of the class.
    pub fn demo_paraffin_58() -> PcmSpec {
        PcmSpec {
            mass_kg: 1000.0,
            cp_solid_j_kgk: 2000.0,
            cp_liquid_j_kgk: 2200.0,
            latent_j_kg: 180_000.0,
            t_melt_c: 58.0,
            melt_range_k: 2.0,
            ua_loss_w_k: 3.0,
            ua_hx_w_k: 800.0,
            t_init_c: 40.0,
        }
    }

    /// Check every field: mass (0, 1e7] kg, both specific heats (0, 10 000] J/(kg·K), latent
    /// heat (0, 1e6] J/kg, melting temperature [0, 200] °C, melt range [0, 20] K, loss UA
    /// [0, 1e5] W/K, exchanger UA (0, 1e6] W/K, start temperature [−50, 250] °C.
    ///
    /// Returns an `Input` error naming the key (`mass_kg`, `cp_solid_j_kgk`, ...; the loss UA
    /// is `ua_w_k` as in the scenario).
    pub fn validate(&self) -> Result<()> {
        positive("mass_kg", self.mass_kg, 1.0e7, "PCM mass, kg")?;
        positive(
            "cp_solid_j_kgk",
            self.cp_solid_j_kgk,
            10_000.0,
            "solid specific heat, J/(kg·K)",
        )?;
        positive(
            "cp_liquid_j_kgk",
            self.cp_liquid_j_kgk,
            10_000.0,
            "liquid specific heat, J/(kg·K)",
        )?;
        positive(
            "latent_j_kg",
            self.latent_j_kg,
            1.0e6,
            "latent heat of melting, J/kg",
        )?;
        in_range(
            "t_melt_c",
            self.t_melt_c,
            0.0,
            200.0,
            "melting temperature, °C",
        )?;
        in_range(
            "melt_range_k",
            self.melt_range_k,
            0.0,
            20.0,
            "melting range, K",
        )?;
        in_range(
            "ua_w_k",
            self.ua_loss_w_k,
            0.0,
            1.0e5,
            "store loss coefficient to the room, W/K",
        )?;
        positive(
            "ua_hx_w_k",
            self.ua_hx_w_k,
            1.0e6,
            "fluid-to-PCM exchanger UA, W/K",
        )?;
        in_range(
            "t_init_c",
            self.t_init_c,
            -50.0,
            250.0,
            "store start temperature, °C",
        )?;
        Ok(())
    }
}

/// What one PCM step did.
#[derive(Debug, Clone, Copy, Default)]
pub struct PcmStep {
    /// Heat the fluid delivered to the PCM, J (negative when the fluid takes heat out).
    pub q_in_j: f64,
    /// Flow-weighted mean fluid outlet temperature, °C (the PCM temperature when there is no flow).
    pub t_out_c: f64,
    /// Heat lost to the room, J.
    pub q_loss_j: f64,
    /// Change of stored energy, J.
    pub delta_stored_j: f64,
    /// Internal sub-steps taken.
    pub substeps: u32,
}

/// State of a phase-change store.
#[derive(Debug, Clone)]
pub struct Pcm {
    spec: PcmSpec,
    /// Specific enthalpy, J/kg, zero for solid at the solidus.
    h_j_kg: f64,
}

/// Largest sub-step, as a fraction of the store's smallest thermal time constant
/// `m·min(cs, cl)/(ṁ cp ε + UA_loss)` (explicit Euler; 1 would be the stability limit).
const MAX_STEP_FRACTION: f64 = 0.25;

impl Pcm {
    /// A store at its start temperature. Call [`PcmSpec::validate`] first.
    pub fn new(spec: &PcmSpec) -> Pcm {
        let mut p = Pcm {
            spec: spec.clone(),
            h_j_kg: 0.0,
        };
        p.h_j_kg = p.specific_enthalpy(spec.t_init_c);
        p
    }

    fn bounds(&self) -> (f64, f64, f64) {
        let s = &self.spec;
        let t1 = s.t_melt_c - 0.5 * s.melt_range_k;
        let t2 = s.t_melt_c + 0.5 * s.melt_range_k;
        let h_liq = s.latent_j_kg + 0.5 * (s.cp_solid_j_kgk + s.cp_liquid_j_kgk) * s.melt_range_k;
        (t1, t2, h_liq)
    }

    fn specific_enthalpy(&self, t_c: f64) -> f64 {
        let s = &self.spec;
        let (t1, t2, h_liq) = self.bounds();
        let (cs, cl, r) = (s.cp_solid_j_kgk, s.cp_liquid_j_kgk, s.melt_range_k);
        if t_c <= t1 {
            cs * (t_c - t1)
        } else if t_c >= t2 {
            h_liq + cl * (t_c - t2)
        } else {
            // Only reached with r > 0.
            let d = t_c - t1;
            s.latent_j_kg * d / r + cs * d + (cl - cs) * d * d / (2.0 * r)
        }
    }

    /// Liquid fraction and temperature from the specific enthalpy.
    fn state(&self) -> (f64, f64) {
        let s = &self.spec;
        let (t1, t2, h_liq) = self.bounds();
        let h = self.h_j_kg;
        if h <= 0.0 {
            (0.0, t1 + h / s.cp_solid_j_kgk)
        } else if h >= h_liq {
            (1.0, t2 + (h - h_liq) / s.cp_liquid_j_kgk)
        } else if s.melt_range_k == 0.0 {
            (h / s.latent_j_kg, s.t_melt_c)
        } else {
            // a f² + b f − h = 0 with a = (cl − cs) r/2, b = λ + cs r; stable root form.
            let r = s.melt_range_k;
            let a = 0.5 * (s.cp_liquid_j_kgk - s.cp_solid_j_kgk) * r;
            let b = s.latent_j_kg + s.cp_solid_j_kgk * r;
            let disc = (b * b + 4.0 * a * h).max(0.0);
            let f = (2.0 * h / (b + disc.sqrt())).clamp(0.0, 1.0);
            (f, t1 + f * r)
        }
    }

    /// PCM temperature, °C (uniform: lumped store).
    pub fn temperature_c(&self) -> f64 {
        self.state().1
    }

    /// Liquid mass fraction, 0 (solid) to 1 (liquid).
    pub fn liquid_fraction(&self) -> f64 {
        self.state().0
    }

    /// Enthalpy of the whole store at `t_c`, J, zero for solid at the solidus
    /// `t_melt − range/2`. Piecewise: solid `m cs (T − T1)`; mushy (linear liquid fraction
    /// over the range) `m [λ f + cs (T − T1) + (cl − cs)(T − T1)²/(2r)]`; liquid
    /// `m [λ + (cs + cl) r/2 + cl (T − T2)]`. Across the transition the difference is
    /// `m [cs (T* − Ta) + λ + cl (Tb − T*)]`.
    ///
    /// * `t_c` – temperature, °C (any finite value; no phase other than solid/liquid modelled)
    ///
    /// Source: Mehling & Cabeza, Heat and cold storage with PCM, Springer 2008, ch. 1.
    pub fn enthalpy_j(&self, t_c: f64) -> f64 {
        self.spec.mass_kg * self.specific_enthalpy(t_c)
    }

    /// Stored heat relative to the store at `t_ref_c`, J: `H − H(t_ref)`.
    pub fn stored_j(&self, t_ref_c: f64) -> f64 {
        self.spec.mass_kg * (self.h_j_kg - self.specific_enthalpy(t_ref_c))
    }

    /// Advance `dt_s` with one fluid stream through the exchanger and losses to the room.
    ///
    /// Per sub-step (explicit in the PCM temperature `T`):
    /// `q_hx = ε ṁ cp (t_in − T)`, `ε = 1 − exp(−UA_hx/(ṁ cp))` (exchanger with an isothermal
    /// side); `q_loss = UA_loss (T − t_room)`; `m Δh = h_sub (q_hx − q_loss)`. Sub-steps keep
    /// `h_sub (ε ṁ cp + UA_loss) ≤ 0.25 m min(cs, cl)`, a quarter of the explicit stability limit
    /// for the smallest heat capacity (during the melt the capacity is larger, so it is safe).
    ///
    /// * `dt_s` – step, s (≤ 0 or non-finite: nothing happens)
    /// * `flow_kg_s` – fluid mass flow, kg/s (≤ 0 or non-finite: no flow)
    /// * `t_in_c` – fluid inlet temperature, °C (non-finite: no flow)
    /// * `cp_j_kgk` – fluid specific heat, J/(kg·K) (≤ 0 or non-finite: no flow)
    /// * `t_room_c` – room temperature, °C (non-finite: no loss)
    ///
    /// Returns heat delivered by the fluid, its mean outlet temperature
    /// `t_in − q_in/(ṁ cp dt)` (the PCM temperature at the end when there is no flow), the
    /// loss and the change of stored energy; `q_in − q_loss = Δstored` to rounding.
    ///
    /// Source: ε-NTU with one side at constant temperature (C_r = 0), Incropera & DeWitt,
    /// Fundamentals of Heat and Mass Transfer, 6th ed., §11.4 (from memory).
    pub fn step(
        &mut self,
        dt_s: f64,
        flow_kg_s: f64,
        t_in_c: f64,
        cp_j_kgk: f64,
        t_room_c: f64,
    ) -> PcmStep {
        let flowing = flow_kg_s.is_finite()
            && flow_kg_s > 0.0
            && t_in_c.is_finite()
            && cp_j_kgk.is_finite()
            && cp_j_kgk > 0.0;
        if !(dt_s.is_finite() && dt_s > 0.0) {
            return PcmStep {
                t_out_c: self.temperature_c(),
                ..PcmStep::default()
            };
        }
        let s = &self.spec;
        let c_fluid = if flowing { flow_kg_s * cp_j_kgk } else { 0.0 };
        let g_hx = if flowing {
            c_fluid * (1.0 - (-s.ua_hx_w_k / c_fluid).exp())
        } else {
            0.0
        };
        let ua_loss = if t_room_c.is_finite() {
            s.ua_loss_w_k
        } else {
            0.0
        };
        let cap_min = s.mass_kg * s.cp_solid_j_kgk.min(s.cp_liquid_j_kgk);
        let subs_f = (dt_s * (g_hx + ua_loss) / (MAX_STEP_FRACTION * cap_min))
            .ceil()
            .max(1.0);
        let subs = if subs_f < u32::MAX as f64 {
            subs_f as u32
        } else {
            u32::MAX
        };
        let h = dt_s / subs as f64;
        let m = s.mass_kg;
        let h0 = self.h_j_kg;
        let (mut q_in, mut q_loss) = (0.0, 0.0);
        for _ in 0..subs {
            let t = self.temperature_c();
            let qi = if flowing {
                h * g_hx * (t_in_c - t)
            } else {
                0.0
            };
            let ql = if ua_loss > 0.0 {
                h * ua_loss * (t - t_room_c)
            } else {
                0.0
            };
            q_in += qi;
            q_loss += ql;
            self.h_j_kg += (qi - ql) / m;
        }
        let t_out_c = if flowing {
            t_in_c - q_in / (c_fluid * dt_s)
        } else {
            self.temperature_c()
        };
        PcmStep {
            q_in_j: q_in,
            t_out_c,
            q_loss_j: q_loss,
            delta_stored_j: m * (self.h_j_kg - h0),
            substeps: subs,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn heat_across_the_melt_matches_sensible_plus_latent() {
        // Demo paraffin, 1000 kg, 40 → 70 °C: Q = m [cs (58 − 40) + λ + cl (70 − 58)]
        // = 1000 [2000·18 + 180 000 + 2200·12] = 242.4 MJ (Mehling & Cabeza 2008 ch. 1 form).
        let p = Pcm::new(&PcmSpec::demo_paraffin_58());
        let q = p.enthalpy_j(70.0) - p.enthalpy_j(40.0);
        assert!((q - 242.4e6).abs() < 1e-3);
        // Isothermal version gives the same total.
        let iso = Pcm::new(&PcmSpec {
            melt_range_k: 0.0,
            ..PcmSpec::demo_paraffin_58()
        });
        assert!((iso.enthalpy_j(70.0) - iso.enthalpy_j(40.0) - 242.4e6).abs() < 1e-3);
    }

    #[test]
    fn temperature_inverts_enthalpy() {
        let spec = PcmSpec::demo_paraffin_58();
        for t in [30.0, 56.5, 57.0, 58.0, 58.9, 59.0, 75.0] {
            let mut p = Pcm::new(&spec);
            p.h_j_kg = p.specific_enthalpy(t);
            assert!((p.temperature_c() - t).abs() < 1e-9, "{t}");
        }
        let mut p = Pcm::new(&spec);
        p.h_j_kg = p.specific_enthalpy(58.0);
        // Half way through the range: f = 0.5.
        assert!((p.liquid_fraction() - 0.5).abs() < 1e-12);
    }

    #[test]
    fn isothermal_melt_exchanger_is_exact() {
        // Isothermal PCM at 58 °C, 40 % melted; 0.2 kg/s of water (cp 4180) at 75 °C through an
        // exchanger of UA 800 W/K for one hour. T stays at 58 °C, so
        // q_in = ε ṁ cp (75 − 58) t, ε = 1 − exp(−800/836) = 0.61593 (Incropera & DeWitt 6th ed. §11.4, C_r = 0).
        let spec = PcmSpec {
            melt_range_k: 0.0,
            ua_loss_w_k: 0.0,
            ..PcmSpec::demo_paraffin_58()
        };
        let mut p = Pcm::new(&spec);
        p.h_j_kg = 0.4 * spec.latent_j_kg;
        let r = p.step(3600.0, 0.2, 75.0, 4180.0, 20.0);
        let c = 0.2 * 4180.0;
        let eps = 1.0 - (-800.0_f64 / c).exp();
        let expected = eps * c * 17.0 * 3600.0;
        assert!((r.q_in_j - expected).abs() < 1e-6 * expected);
        assert!((p.temperature_c() - 58.0).abs() < 1e-12);
        assert!((r.t_out_c - (75.0 - eps * 17.0)).abs() < 1e-9);
    }

    #[test]
    fn energy_balance_closes_and_bad_input_is_safe() {
        let mut p = Pcm::new(&PcmSpec::demo_paraffin_58());
        let mut total = 0.0;
        for hour in 0..48 {
            let (f, t_in) = if hour < 24 { (0.3, 80.0) } else { (0.3, 30.0) };
            let r = p.step(3600.0, f, t_in, 4180.0, 20.0);
            let resid = r.q_in_j - r.q_loss_j - r.delta_stored_j;
            assert!(resid.abs() <= 1e-9 * p.enthalpy_j(80.0));
            total += r.delta_stored_j;
        }
        assert!((total - p.stored_j(40.0)).abs() < 1e-6 * p.enthalpy_j(80.0));
        let r = p.step(3600.0, f64::NAN, 50.0, 4180.0, f64::NAN);
        assert!(r.t_out_c.is_finite() && r.q_in_j == 0.0 && r.q_loss_j == 0.0);
        let bad = PcmSpec {
            latent_j_kg: 0.0,
            ..PcmSpec::demo_paraffin_58()
        };
        assert!(bad.validate().is_err());
        assert!(PcmSpec::demo_paraffin_58().validate().is_ok());
    }
}
