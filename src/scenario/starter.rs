pub const STARTER: &str = include_str!("../../scenarios/port-meridian-clinic.toml");
