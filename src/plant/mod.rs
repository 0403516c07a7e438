//! The hour loop: couples each option's solar field, store, cooling route, heat demand and
//! backup boiler, and keeps the energy books — the ledger of [`HourRecord`].
//!
//! Per hour: the machine's cut-in control (hysteresis on the store's top, minimum run and off
//! times) decides whether a route on store heat alone may draw; the route says what heat it
//! wants and at what supply. Then in `SUBSTEPS` equal sub-steps (7.5 min): the collector
//! thermostat acts within the sub-step on the field's heat-capacity node ([`field_node`]):
//! a stopped field warms until it is `dt_on_k` above the store's bottom, a running loop (solved
//! at steady state for its outlet at the store's bottom, through the loop heat exchanger when
//! there is one) stops when its outlet rise decays to `dt_off_k`; the route's and the heat
//! demand's draws are planned from the store's top (no store heat below a route's supply unless
//! its boiler lifts it) and throttled to their plan; the store is stepped with all streams at
//! once (it sub-steps further inside where a node would go unstable). What the store could not
//! give, the boiler gives where the route allows. A start of the machine takes its warm-up heat
//! from the driving heat. The ledger splits cooling by source and electricity by use; every
//! hour records the store's balance `in − out − losses − Δstored` and the plant's first law.

pub mod field_node;
pub mod record;
pub mod store;

pub use record::HourRecord;

use crate::components::boiler::Boiler;
use crate::components::collector::Ambient;
use crate::components::field::Field;
use crate::components::tank::Stream;
use crate::routes::{HeatSupplied, HourConditions, Reason, Route, RouteHour};
use crate::scenario::schema::HeatPriority;
use crate::sun::sky::PlaneIrradiance;
use store::{MAX_STREAMS, Store, charge, draw};

/// Sub-steps per hour of the plant loop (fixed; `YearInputs::substeps` may set another number
/// to test that results do not depend on it: halving the sub-step from 7.5 to 3.75 min changes
/// every demo option's annual solar heat, cooling and electricity by less than 1 %, where 15 min
/// against 7.5 min moved one option's solar heat by 1.2 % — the draws of machines on store heat
/// alone stop at the first sub-step that starts with the store's top below their supply).
pub const SUBSTEPS: usize = 8;
const J_PER_KWH: f64 = 3.6e6;

/// The building's heat demand in one hour (served by the store where the option says so).
#[derive(Debug, Clone, Copy, Default)]
pub struct HeatDemandHour {
    /// Domestic hot water heat, kWh, to raise `t_cold_c` to `t_dhw_c`.
    pub dhw_kwh: f64,
    pub t_cold_c: f64,
    pub t_dhw_c: f64,
    /// Space heating, kWh, on a loop at `t_sh_supply_c` / `t_sh_return_c`.
    pub sh_kwh: f64,
    pub t_sh_supply_c: f64,
    pub t_sh_return_c: f64,
}

impl HeatDemandHour {
    pub fn total_kwh(&self) -> f64 {
        self.dhw_kwh + self.sh_kwh
    }
}

/// Collector field, store and their controls.
#[derive(Debug, Clone)]
pub struct SolarLoop {
    pub field: Field,
    /// Plane irradiance on the field, one per hour of the year (computed once per scenario).
    pub poa: Vec<PlaneIrradiance>,
    /// Collector-loop heat exchanger effectiveness (indirect loop), equal capacity rates on
    /// both sides; `None` for a direct loop.
    pub hx_effectiveness: Option<f64>,
    /// Pump electric power while running, W.
    pub pump_w: f64,
    /// Heat capacity of the field (collectors' effective capacity, their fluid and the loop's
    /// pipes), J/K ([`field_node`]); 0 for the steady-state loop.
    pub field_capacity_j_k: f64,
    pub dt_on_k: f64,
    pub dt_off_k: f64,
    /// Collection stops at this store-top temperature, °C.
    pub t_max_c: f64,
    /// Plant room, °C.
    pub t_room_c: f64,
    /// Specific heat of the store water, J/(kg·K).
    pub cp_j_kgk: f64,
    /// Specific heat of the collector-loop fluid (water or glycol), J/(kg·K).
    pub cp_loop_j_kgk: f64,
    /// The store at the start of the year.
    pub store: Store,
}

/// One option ready to run.
pub struct PlantOption {
    pub name: String,
    pub route: Box<dyn Route>,
    pub solar: Option<SolarLoop>,
    pub boiler: Boiler,
    pub serves_heat_demand: bool,
}

/// Everything the loop reads that is common to all options.
pub struct YearInputs<'a> {
    pub conditions: &'a [HourConditions],
    /// What the collectors see of the outdoors each hour: air temperature (the conditions'
    /// dry-bulb), wind speed and long-wave irradiance (computed once per scenario).
    pub ambient: &'a [Ambient],
    /// Global horizontal, direct normal and diffuse horizontal irradiance per hour, W/m².
    pub ghi_w_m2: &'a [f64],
    pub dni_w_m2: &'a [f64],
    pub dhi_w_m2: &'a [f64],
    pub heat_demand: &'a [HeatDemandHour],
    pub priority: HeatPriority,
    /// Sub-steps per hour ([`SUBSTEPS`]).
    pub substeps: usize,
}

/// A planned draw on the store for one sub-step.
#[derive(Debug, Clone, Copy, Default)]
struct Draw {
    /// Store stream (zero flow when the store cannot help).
    flow_kg_s: f64,
    t_return_c: f64,
}

/// Plan a draw of `power_w` at supply `t_need_c` returning at `t_return_c` from a store whose
/// top is at `t_top_c`: when the top is hot enough a mixing valve takes only what is needed;
/// when it is warmer than the return but short of the need, the full flow passes and the
/// boiler lifts it (`boiler_lifts`) — without a boiler behind the draw, a store short of the
/// need gives nothing, so heat is never drawn below the temperature the machine is solved at;
/// when it is colder than the return, the store is bypassed.
fn plan_draw(
    power_w: f64,
    t_need_c: f64,
    t_return_c: f64,
    t_top_c: f64,
    cp: f64,
    boiler_lifts: bool,
) -> Draw {
    if power_w <= 0.0 || t_top_c <= t_return_c + 0.1 || (!boiler_lifts && t_top_c < t_need_c) {
        return Draw {
            flow_kg_s: 0.0,
            t_return_c,
        };
    }
    let lift = if t_top_c >= t_need_c {
        t_top_c - t_return_c
    } else {
        t_need_c - t_return_c
    };
    Draw {
        flow_kg_s: power_w / (cp * lift),
        t_return_c,
    }
}

/// Run one option over the year; one record per hour.
pub fn simulate(opt: &PlantOption, y: &YearInputs) -> Vec<HourRecord> {
    let mut solar = opt.solar.clone();
    let substeps = y.substeps.max(1);
    let dt_s = 3600.0 / substeps as f64;
    let mut pump_on = false;
    // The field's heat capacity: one node, starting at the first hour's air temperature.
    let mut node = field_node::FieldNode {
        t_c: y.conditions.first().map_or(20.0, |c| c.t_db_c),
        capacity_j_k: solar.as_ref().map_or(0.0, |s| s.field_capacity_j_k),
        t_max_c: solar.as_ref().map_or(f64::INFINITY, |s| s.t_max_c),
    };
    // The heat-driven machine's cut-in control (hysteresis on the store's top), its start-up
    // cost and run/off limits: hours it has run, or rested, in a row.
    let mut enabled = false;
    let start_up = opt.route.start_up();
    let (min_run_h, min_off_h) = start_up.map_or((1, 0), |s| (s.min_run_h, s.min_off_h));
    let mut running = false;
    let mut run_h = 0u32;
    let mut off_h = u32::MAX;
    let mut out = Vec::with_capacity(y.conditions.len());
    for (i, c) in y.conditions.iter().enumerate() {
        let hd = if opt.serves_heat_demand {
            y.heat_demand[i]
        } else {
            HeatDemandHour::default()
        };
        let hd_all = y.heat_demand[i];
        let mut rec = HourRecord {
            hour: i,
            t_amb_c: c.t_db_c,
            t_wb_c: c.t_wb_c,
            w_kg_kg: c.w_kg_kg,
            ghi_w_m2: y.ghi_w_m2[i],
            dni_w_m2: y.dni_w_m2[i],
            dhi_w_m2: y.dhi_w_m2[i],
            load_kwh: c.load.cooling_kw(),
            heat_demand_kwh: hd_all.total_kwh(),
            ..HourRecord::default()
        };
        let t_top0 = solar.as_ref().map(|s| s.store.t_top_c());
        // What the route may see of the store: everything for a route without a cut-in
        // (boiler-backed or heat-free), nothing while a cut-in route is disabled.
        let t_route = match (opt.route.cut_in_out_c(), t_top0) {
            (Some((cut_in, cut_out)), Some(t)) => {
                if t >= cut_in {
                    enabled = true;
                } else if t < cut_out && run_h >= min_run_h {
                    enabled = false;
                }
                // A stopped machine rests its minimum off time before it may start again.
                (enabled && (running || off_h >= min_off_h)).then_some(t)
            }
            (Some(_), None) => None,
            (None, t) => t,
        };
        let request = opt.route.heat_request(c, t_route);
        let mut route_solar_j = 0.0;
        let mut demand_solar_j = 0.0;
        if let Some(s) = solar.as_mut() {
            let poa = s.poa[i];
            let amb = y.ambient[i];
            rec.poa_w_m2 = poa.total_w_m2();
            rec.poa_beam_w_m2 = poa.beam_w_m2;
            rec.poa_diffuse_w_m2 = poa.diffuse_w_m2();
            let stored0 = s.store.stored_j();
            let mut q_collected_j = 0.0;
            let mut q_loss_j = 0.0;
            let mut q_in_sum_j = 0.0;
            let sky = field_node::Sky {
                beam_w_m2: poa.beam_w_m2,
                diffuse_w_m2: poa.diffuse_w_m2(),
                aoi_deg: poa.aoi_deg,
                amb,
            };
            for _ in 0..substeps {
                let (t_top, t_bot) = (s.store.t_top_c(), s.store.t_bottom_c());
                // Collector loop: differential thermostat with dead-band, store maximum.
                let mut streams = [Stream {
                    flow_kg_s: 0.0,
                    t_in_c: 0.0,
                    inlet: crate::components::tank::Inlet::Top,
                }; MAX_STREAMS];
                let mut n = 1;
                // Collector loop over the sub-step, with the thermostat acting at the moment
                // its condition is met (not only at sub-step boundaries): a stopped field
                // warms until its sensor (the node) is `dt_on_k` above the store's bottom, a
                // running loop stops when its outlet rise falls to `dt_off_k`. The store's
                // temperatures are those at the start of the sub-step. The running time and
                // the heat delivered make one stream of the average flow.
                let mut t_left = dt_s;
                let mut run_s = 0.0;
                let mut flow_time_kg = 0.0;
                let mut heat_j = 0.0;
                let mut started = false;
                for _ in 0..6 {
                    if t_left <= 0.0 {
                        break;
                    }
                    if t_top >= s.t_max_c {
                        let t_stag = s.field.no_flow_temp_c(
                            poa.beam_w_m2,
                            poa.diffuse_w_m2(),
                            poa.aoi_deg,
                            &amb,
                        );
                        if rec.poa_w_m2 > 0.0 && t_stag > t_bot + s.dt_on_k {
                            rec.stagnation = true;
                        }
                        pump_on = false;
                        node.idle(&s.field, &sky, t_left);
                        break;
                    }
                    if !pump_on {
                        // When does the sensor call for the pump?
                        let t_on = t_bot + s.dt_on_k;
                        let wait = if node.capacity_j_k > 0.0 {
                            node.idle_time_to(&s.field, &sky, t_on)
                        } else {
                            let t_nf = s.field.no_flow_temp_c(
                                poa.beam_w_m2,
                                poa.diffuse_w_m2(),
                                poa.aoi_deg,
                                &amb,
                            );
                            (rec.poa_w_m2 > 0.0 && t_nf > t_on).then_some(0.0)
                        };
                        match wait {
                            Some(w) if w < t_left => {
                                node.idle(&s.field, &sky, w);
                                t_left -= w;
                                pump_on = true;
                                started = true;
                            }
                            _ => {
                                node.idle(&s.field, &sky, t_left);
                                break;
                            }
                        }
                    }
                    // Running: the loop's steady state plus what the node releases.
                    let lp = collector_loop(s, &poa, t_bot, &amb);
                    let fc = lp.flow_kg_s * s.cp_j_kgk;
                    let rise_ss = lp.t_to_store_c - t_bot;
                    let t_run = if node.capacity_j_k > 0.0 && lp.mcp_loop_w_k > 0.0 && fc > 0.0 {
                        let tau = node.capacity_j_k / (2.0 * lp.mcp_loop_w_k);
                        // Rise above the steady one from the node's release, at t = 0, K.
                        let r0 = node.capacity_j_k * (node.t_c - lp.t_field_mean_c) / tau / fc;
                        if rise_ss >= s.dt_off_k {
                            t_left
                        } else if rise_ss + r0 > s.dt_off_k {
                            (tau * (r0 / (s.dt_off_k - rise_ss)).ln()).min(t_left)
                        } else {
                            0.0
                        }
                    } else if rise_ss >= s.dt_off_k || (started && rise_ss > 0.0) {
                        t_left
                    } else {
                        0.0
                    };
                    if t_run > 0.0 {
                        heat_j += fc * rise_ss * t_run
                            + node.run(lp.t_field_mean_c, lp.mcp_loop_w_k, t_run);
                        flow_time_kg += lp.flow_kg_s * t_run;
                        run_s += t_run;
                        t_left -= t_run;
                    }
                    if t_left > 0.0 {
                        // Stopped within the sub-step: the rest idles (and may call the pump
                        // again); stopped at once, the rest idles to the end.
                        pump_on = false;
                    }
                    if t_run <= 0.0 {
                        node.idle(&s.field, &sky, t_left);
                        t_left = 0.0;
                    }
                }
                if run_s > 0.0 && flow_time_kg > 0.0 {
                    let flow = flow_time_kg / dt_s;
                    streams[0] = charge(flow, t_bot + heat_j / (flow_time_kg * s.cp_j_kgk));
                    rec.pump_hours += run_s / 3600.0;
                }
                // Draws: the route's, then hot water, then space heating, in priority order.
                let mut draws = [Draw::default(); 3];
                if let Some(r) = request {
                    draws[0] = plan_draw(
                        r.heat_kwh * 1000.0,
                        r.t_supply_c,
                        r.t_return_c,
                        t_top,
                        s.cp_j_kgk,
                        r.boiler_backup,
                    );
                }
                draws[1] = plan_draw(
                    hd.dhw_kwh * 1000.0,
                    hd.t_dhw_c,
                    hd.t_cold_c,
                    t_top,
                    s.cp_j_kgk,
                    true,
                );
                draws[2] = plan_draw(
                    hd.sh_kwh * 1000.0,
                    hd.t_sh_supply_c,
                    hd.t_sh_return_c,
                    t_top,
                    s.cp_j_kgk,
                    true,
                );
                if let Some(r) = request {
                    let route_short = t_top < r.t_supply_c;
                    match y.priority {
                        // Keep the hot layer for the route: heat demand only draws when the
                        // store can give the route all it needs.
                        HeatPriority::CoolingFirst if route_short && r.heat_kwh > 0.0 => {
                            draws[1].flow_kg_s = 0.0;
                            draws[2].flow_kg_s = 0.0;
                        }
                        HeatPriority::HeatingFirst
                            if hd.total_kwh() > 0.0 && t_top < hd.t_dhw_c.max(hd.t_sh_supply_c) =>
                        {
                            draws[0].flow_kg_s = 0.0;
                        }
                        _ => {}
                    }
                }
                for d in &draws {
                    streams[n] = draw(d.flow_kg_s, d.t_return_c);
                    n += 1;
                }
                // Heat each draw was planned to take this sub-step, J.
                let planned_j = [request.map_or(0.0, |r| r.heat_kwh), hd.dhw_kwh, hd.sh_kwh]
                    .map(|kwh| kwh * 1000.0 * dt_s);
                let before = (draws.iter().any(|d| d.flow_kg_s > 0.0)).then(|| s.store.clone());
                let mut r = s.store.step(dt_s, &streams[..n], s.t_room_c, s.cp_j_kgk);
                // A draw planned at the sub-step's starting top temperature takes more than
                // planned when the top warms during the step (the collector charging it); the
                // mixing valve would throttle, so the step is taken again from the same state
                // with that draw's flow scaled to its plan (the first law of the hour then
                // closes: no heat leaves the store that nobody uses).
                if let Some(before) = before {
                    // The heat drawn rises with the flow but not in proportion (the top cools
                    // as it is drawn): a few rescalings bring each draw to its plan.
                    for _ in 0..8 {
                        let mut redo = false;
                        for (k, want) in planned_j.iter().enumerate() {
                            let got = -r.q_in_j[1 + k];
                            if got > want * (1.0 + 1e-7) && got > 0.0 {
                                streams[1 + k].flow_kg_s *= want / got;
                                redo = true;
                            }
                        }
                        if !redo {
                            break;
                        }
                        s.store = before.clone();
                        r = s.store.step(dt_s, &streams[..n], s.t_room_c, s.cp_j_kgk);
                    }
                }
                q_collected_j += r.q_in_j[0];
                // Draw streams have q_in < 0: heat out of the store.
                route_solar_j += -r.q_in_j[1];
                demand_solar_j += -(r.q_in_j[2] + r.q_in_j[3]);
                q_in_sum_j += r.q_in_j[..n].iter().sum::<f64>();
                q_loss_j += r.q_loss_j;
            }
            let stored1 = s.store.stored_j();
            rec.solar_heat_kwh = q_collected_j / J_PER_KWH;
            rec.store_loss_kwh = q_loss_j / J_PER_KWH;
            rec.store_delta_kwh = (stored1 - stored0) / J_PER_KWH;
            // Closure from the store's own end states, independent of its reported Δ.
            rec.balance_error_kwh = (q_in_sum_j - q_loss_j - (stored1 - stored0)) / J_PER_KWH;
            rec.balance_error_rel =
                (rec.balance_error_kwh * J_PER_KWH).abs() / stored1.abs().max(1.0);
            rec.t_store_c = Some(s.store.t_mean_c());
            rec.t_store_top_c = Some(s.store.t_top_c());
            rec.pump_kwh = s.pump_w * rec.pump_hours / 1000.0;
        }
        // Route: solar heat it got, backup for the rest of what it asked.
        let heat = request.map(|r| {
            let solar_kwh = (route_solar_j / J_PER_KWH).max(0.0);
            HeatSupplied {
                solar_kwh,
                backup_kwh: if r.boiler_backup {
                    (r.heat_kwh - solar_kwh).max(0.0)
                } else {
                    0.0
                },
            }
        });
        // A start: the machine's thermal mass is warmed from the plant room to the drive
        // temperature with the first driving heat it gets (the rest drives it).
        let given = heat.map_or(0.0, |h| h.solar_kwh + h.backup_kwh);
        let mut heat_to_run = heat;
        if let (Some(su), Some(r), false) = (start_up, request, running)
            && given > 0.0
        {
            let t_idle = solar.as_ref().map_or(c.t_db_c, |s| s.t_room_c);
            let need = su.thermal_mass_kj_k * (r.t_supply_c - t_idle).max(0.0) / 3600.0;
            rec.startup_heat_kwh = need.min(given);
            rec.machine_starts = 1;
            let keep = (given - rec.startup_heat_kwh) / given;
            heat_to_run = heat.map(|h| HeatSupplied {
                solar_kwh: h.solar_kwh * keep,
                backup_kwh: h.backup_kwh * keep,
            });
        }
        let rh: RouteHour = opt.route.run(c, t_route, heat_to_run);
        let (heat_solar, heat_backup) = heat.map_or((0.0, 0.0), |h| (h.solar_kwh, h.backup_kwh));
        running = given > 0.0;
        if running {
            run_h = run_h.saturating_add(1);
            off_h = 0;
        } else {
            off_h = off_h.saturating_add(1);
            run_h = 0;
        }
        rec.heat_to_route_kwh = heat_solar + heat_backup;
        rec.route_solar_kwh = heat_solar;
        rec.backup_heat_kwh += heat_backup;
        let demand_solar_kwh = (demand_solar_j / J_PER_KWH).max(0.0);
        rec.heat_demand_solar_kwh = demand_solar_kwh.min(hd_all.total_kwh());
        rec.backup_heat_kwh += (hd_all.total_kwh() - demand_solar_kwh).max(0.0);
        rec.fuel_kwh = opt.boiler.fuel_kwh(rec.backup_heat_kwh);
        // Cooling by source: the heat-driven machine's cooling splits between solar and backup
        // heat in proportion to the driving heat each gave; electric cooling splits between
        // the grid and the option's own PV in proportion to the electricity each gave.
        let solar_share = if rec.heat_to_route_kwh > 0.0 {
            heat_solar / rec.heat_to_route_kwh
        } else {
            0.0
        };
        rec.cooling_solar_kwh = rh.cooling.heat_driven_kwh * solar_share;
        rec.cooling_backup_heat_kwh = rh.cooling.heat_driven_kwh - rec.cooling_solar_kwh;
        rec.cooling_evaporative_kwh = rh.cooling.evaporative_kwh;
        let route_elec = rh.electricity_kwh();
        let pv_share = if route_elec > 0.0 {
            (rh.pv_used_kwh / route_elec).clamp(0.0, 1.0)
        } else {
            0.0
        };
        rec.cooling_pv_kwh = rh.cooling.electric_kwh * pv_share;
        rec.cooling_electric_kwh = rh.cooling.electric_kwh - rec.cooling_pv_kwh;
        rec.cooling_kwh = rh.cooling_kwh();
        rec.unmet_kwh = rh.unmet_kwh;
        rec.elec_compressor_kwh = rh.electricity.compressor_kwh;
        rec.elec_heat_rejection_kwh = rh.electricity.heat_rejection_kwh;
        rec.elec_pumps_kwh = rh.electricity.pumps_kwh;
        rec.elec_air_handling_kwh = rh.electricity.air_handling_kwh;
        rec.electricity_kwh = route_elec + rec.pump_kwh;
        rec.heat_rejected_kwh = rh.heat_rejected_kwh;
        let heat_driven = rh.cooling.heat_driven_kwh;
        rec.cop_thermal = (rec.heat_to_route_kwh > 0.0 && heat_driven > 0.0)
            .then(|| heat_driven / rec.heat_to_route_kwh);
        rec.cop_electric =
            (rec.electricity_kwh > 0.0).then(|| rec.cooling_kwh / rec.electricity_kwh);
        // A machine off for want of store heat: "no sun" when no solar heat came in this hour
        // (or the option has no field), "store below cut-in" while the field is collecting.
        rec.reason = match rh.reason {
            Reason::StoreBelowCutIn if solar.is_none() || rec.solar_heat_kwh <= 0.0 => {
                Reason::NoSun
            }
            r => r,
        };
        rec.water_m3 = rh.water_m3;
        rec.t_drive_c = rh.t_drive_c;
        rec.t_sink_c = rh.t_sink_c;
        rec.t_chw_c = rh.t_chw_c;
        rec.pv_used_kwh = rh.pv_used_kwh;
        rec.pv_export_kwh = rh.pv_export_kwh;
        rec.grid_kwh = rec.electricity_kwh - rh.pv_used_kwh;
        rec.detail = rh.detail;
        // The plant's first law over the hour (record docs).
        let boiler_loss = rec.fuel_kwh - rec.backup_heat_kwh;
        rec.plant_balance_kwh =
            rec.solar_heat_kwh + rec.fuel_kwh + rec.electricity_kwh + rec.cooling_kwh
                - rec.heat_rejected_kwh
                - rec.store_loss_kwh
                - rec.store_delta_kwh
                - hd_all.total_kwh()
                - boiler_loss
                - rec.pump_kwh
                - rec.startup_heat_kwh;
        out.push(rec);
    }
    out
}

/// The collector loop's steady state with the pump running.
#[derive(Debug, Clone, Copy)]
struct LoopState {
    /// Store-side flow, kg/s, and the temperature it brings to the store, °C.
    flow_kg_s: f64,
    t_to_store_c: f64,
    /// The field's mean temperature (collector inlet and outlet), °C.
    t_field_mean_c: f64,
    /// The collector loop's capacity rate, W/K.
    mcp_loop_w_k: f64,
}

/// Collector loop with the pump running: mass flow and the temperature it brings to the
/// store. For an indirect loop with equal capacity rates on both sides of an exchanger of
/// effectiveness ε, the collector inlet is `t_co − ε (t_co − t_store)` and the store receives
/// `t_store + ε (t_co − t_store)`; the collector inlet is found by fixed-point iteration
/// (a contraction: the collector outlet rises less than its inlet). `amb` is the hour's air
/// temperature, wind and long-wave irradiance ([`Field::run`]).
fn collector_loop(
    s: &SolarLoop,
    poa: &PlaneIrradiance,
    t_store_c: f64,
    amb: &Ambient,
) -> LoopState {
    let run = |t_in: f64| {
        s.field
            .run(t_in, poa.beam_w_m2, poa.diffuse_w_m2(), poa.aoi_deg, amb)
    };
    match s.hx_effectiveness {
        None => {
            let o = run(t_store_c);
            LoopState {
                flow_kg_s: o.flow_kg_s,
                t_to_store_c: o.t_out_c,
                t_field_mean_c: 0.5 * (t_store_c + o.t_out_c),
                mcp_loop_w_k: o.flow_kg_s * s.field.cp_j_kgk,
            }
        }
        Some(eff) => {
            let mut t_ci = t_store_c;
            let mut o = run(t_ci);
            for _ in 0..30 {
                let next = o.t_out_c - eff * (o.t_out_c - t_store_c);
                if (next - t_ci).abs() < 1e-6 {
                    break;
                }
                t_ci = next;
                o = run(t_ci);
            }
            // The store side runs at the same capacity rate: its water flow is the loop's
            // scaled by the ratio of specific heats.
            LoopState {
                flow_kg_s: o.flow_kg_s * s.cp_loop_j_kgk / s.cp_j_kgk,
                t_to_store_c: t_store_c + eff * (o.t_out_c - t_store_c),
                t_field_mean_c: 0.5 * (t_ci + o.t_out_c),
                mcp_loop_w_k: o.flow_kg_s * s.cp_loop_j_kgk,
            }
        }
    }
}
