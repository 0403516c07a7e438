//! One face for the two kinds of store the plant loop can run: a stratified water tank and a
//! phase-change store.

use crate::components::pcm::Pcm;
use crate::components::tank::{Inlet, Stream, Tank};

/// Largest number of streams through a store in one step (charge, route, hot water, heating).
pub const MAX_STREAMS: usize = 4;

/// Heat flows of one store step, J (positive into the store).
#[derive(Debug, Clone, Copy, Default)]
pub struct StoreStep {
    pub q_in_j: [f64; MAX_STREAMS],
    pub q_loss_j: f64,
    pub delta_stored_j: f64,
}

/// A store.
#[derive(Debug, Clone)]
pub enum Store {
    Tank(Box<Tank>),
    Pcm(Pcm),
}

impl Store {
    /// Temperature at the top (hot draw-off), °C.
    pub fn t_top_c(&self) -> f64 {
        match self {
            Store::Tank(t) => t.t_top_c(),
            Store::Pcm(p) => p.temperature_c(),
        }
    }

    /// Temperature at the bottom (collector-loop return), °C.
    pub fn t_bottom_c(&self) -> f64 {
        match self {
            Store::Tank(t) => t.t_bottom_c(),
            Store::Pcm(p) => p.temperature_c(),
        }
    }

    /// Mean temperature, °C (reported as the store temperature).
    pub fn t_mean_c(&self) -> f64 {
        match self {
            Store::Tank(t) => t.t_mean_c(),
            Store::Pcm(p) => p.temperature_c(),
        }
    }

    /// Heat stored above 0 °C, J.
    pub fn stored_j(&self) -> f64 {
        match self {
            Store::Tank(t) => t.stored_j(0.0),
            Store::Pcm(p) => p.stored_j(0.0),
        }
    }

    /// Advance `dt_s` seconds with the given streams.
    ///
    /// A phase-change store has one heat exchanger: the streams take turns through it by
    /// operator splitting — each flows for `dt/n` at `n` times its flow, so each moves the
    /// same mass as over the whole step, and losses act over the whole step.
    pub fn step(
        &mut self,
        dt_s: f64,
        streams: &[Stream],
        t_room_c: f64,
        cp_j_kgk: f64,
    ) -> StoreStep {
        let mut out = StoreStep::default();
        match self {
            Store::Tank(t) => {
                let r = t.step(dt_s, streams, t_room_c, 0.0);
                out.q_in_j[..streams.len()].copy_from_slice(&r.q_in_j[..streams.len()]);
                out.q_loss_j = r.q_loss_j;
                out.delta_stored_j = r.delta_stored_j;
            }
            Store::Pcm(p) => {
                let n_active = streams.iter().filter(|s| s.flow_kg_s > 0.0).count();
                if n_active == 0 {
                    let r = p.step(dt_s, 0.0, t_room_c, cp_j_kgk, t_room_c);
                    out.q_loss_j = r.q_loss_j;
                    out.delta_stored_j = r.delta_stored_j;
                } else {
                    let n = n_active as f64;
                    for (i, s) in streams
                        .iter()
                        .enumerate()
                        .filter(|(_, s)| s.flow_kg_s > 0.0)
                    {
                        let r = p.step(dt_s / n, s.flow_kg_s * n, s.t_in_c, cp_j_kgk, t_room_c);
                        out.q_in_j[i] = r.q_in_j;
                        out.q_loss_j += r.q_loss_j;
                        out.delta_stored_j += r.delta_stored_j;
                    }
                }
            }
        }
        out
    }
}

/// A charging stream from the collector loop: enters through a stratifier at the node that
/// matches its temperature (so warm water never stirs a hotter top), leaves at the bottom.
pub fn charge(flow_kg_s: f64, t_in_c: f64) -> Stream {
    Stream {
        flow_kg_s,
        t_in_c,
        inlet: Inlet::StratifiedCharge,
    }
}

/// A draw: hot water leaves at the top; the return enters through a stratifier at the node
/// that matches its temperature (a warm return never heats the bottom).
pub fn draw(flow_kg_s: f64, t_return_c: f64) -> Stream {
    Stream {
        flow_kg_s,
        t_in_c: t_return_c,
        inlet: Inlet::StratifiedReturn,
    }
}
