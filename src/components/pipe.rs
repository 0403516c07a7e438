//! Insulated pipe between the collector field and the plant room, with a uniform heat loss
//! per metre to a constant surrounding temperature.
//!
//! The outlet follows the exact solution for a tube with uniform conductance per length and a
//! constant surrounding temperature (Incropera et al., *Fundamentals of Heat and Mass
//! Transfer*, 7th ed., Wiley 2011, §8.3.3, eq. 8.46 for an external fluid at fixed
//! temperature, with `U·A_s` written as `UA' · L`; equation number from memory):
//!
//! `t_out = ta + (t_in − ta) · exp(−UA' L / (ṁ cp))`
//!
//! The field splits `length_m` half to the supply and half to the return run (Duffie &
//! Beckman, *Solar Engineering of Thermal Processes*, 4th ed., §10.3, treat the same two runs
//! as inlet and outlet duct losses). Heat lost by standing fluid when the pump is off is not
//! modelled.

use crate::error::Result;
use crate::validate::in_range;

/// A pipe run: total length and loss conductance per metre.
#[derive(Debug, Clone, Copy, PartialEq, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pipe {
    /// Total length of supply plus return, m.
    pub length_m: f64,
    /// Heat loss conductance per metre of pipe, W/(m·K).
    pub ua_w_mk: f64,
}

impl Pipe {
    /// Check the inputs: `0 ≤ length_m ≤ 10000` m, `0 ≤ ua_w_mk ≤ 10` W/(m·K) (an insulated
    /// DN 20–50 pipe is about 0.15–0.4 W/(m·K), common practice).
    pub fn validate(&self) -> Result<()> {
        in_range(
            "length_m",
            self.length_m,
            0.0,
            10_000.0,
            "supply plus return pipe length, m",
        )?;
        in_range(
            "ua_w_mk",
            self.ua_w_mk,
            0.0,
            10.0,
            "pipe heat loss per metre, W/(m·K)",
        )
    }

    /// Outlet temperature of a run of `length_m` carrying `flow_kg_s`, °C:
    /// `t_out = ta + (t_in − ta) exp(−UA' L/(ṁ cp))`.
    ///
    /// * `t_in_c` – inlet temperature, °C
    /// * `flow_kg_s` – mass flow, kg/s
    /// * `cp_j_kgk` – fluid specific heat, J/(kg·K)
    /// * `t_amb_c` – surrounding temperature, °C
    /// * `length_m` – length of this run, m (the field passes half of `self.length_m`)
    ///
    /// Zero or negative flow: no stream, returns `t_in_c`.
    ///
    /// Source: Incropera et al., 7th ed., §8.3.3, eq. 8.46 (from memory).
    pub fn outlet_c(
        &self,
        t_in_c: f64,
        flow_kg_s: f64,
        cp_j_kgk: f64,
        t_amb_c: f64,
        length_m: f64,
    ) -> f64 {
        let c = flow_kg_s * cp_j_kgk;
        if c.is_nan() || c <= 0.0 {
            return t_in_c;
        }
        t_amb_c + (t_in_c - t_amb_c) * (-self.ua_w_mk * length_m.max(0.0) / c).exp()
    }

    /// Heat lost by the stream in that run, W: `ṁ cp (t_in − t_out)` (negative when the
    /// surroundings are warmer than the fluid). Same arguments and source as
    /// [`Self::outlet_c`]; zero flow gives 0.
    pub fn loss_w(
        &self,
        t_in_c: f64,
        flow_kg_s: f64,
        cp_j_kgk: f64,
        t_amb_c: f64,
        length_m: f64,
    ) -> f64 {
        let c = flow_kg_s * cp_j_kgk;
        if c.is_nan() || c <= 0.0 {
            return 0.0;
        }
        c * (t_in_c - self.outlet_c(t_in_c, flow_kg_s, cp_j_kgk, t_amb_c, length_m))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand calculation: 40 m of pipe at 0.25 W/(m·K), 0.5 kg/s of water (cp 4180),
    /// 80 °C in, 20 °C around: exponent 10/2090 = 0.0047847, t_out = 20 + 60·e^−0.0047847
    /// = 79.713604 °C, loss 2090·60·(1 − e^−0.0047847) = 598.567 W (exact solution of the tube energy
    /// balance, Incropera 7th ed. eq. 8.46).
    #[test]
    fn pipe_by_hand() {
        let p = Pipe {
            length_m: 40.0,
            ua_w_mk: 0.25,
        };
        let t = p.outlet_c(80.0, 0.5, 4180.0, 20.0, 40.0);
        let expected = 20.0 + 60.0 * (-10.0f64 / 2090.0).exp();
        assert!((t - expected).abs() < 1e-12);
        assert!((t - 79.7136).abs() < 1e-4, "{t}");
        let q = p.loss_w(80.0, 0.5, 4180.0, 20.0, 40.0);
        assert!((q - 598.567).abs() < 1e-3, "{q}");
        // short-pipe limit: loss → UA' L (t_in − ta) = 600 W
        assert!((q - 600.0).abs() < 2.0);
    }

    #[test]
    fn zero_flow_is_no_stream() {
        let p = Pipe {
            length_m: 40.0,
            ua_w_mk: 0.25,
        };
        assert_eq!(p.outlet_c(80.0, 0.0, 4180.0, 20.0, 20.0), 80.0);
        assert_eq!(p.loss_w(80.0, 0.0, 4180.0, 20.0, 20.0), 0.0);
    }

    #[test]
    fn validate_names_the_key() {
        let p = Pipe {
            length_m: -1.0,
            ua_w_mk: 0.25,
        };
        assert!(p.validate().unwrap_err().to_string().contains("length_m"));
    }
}
