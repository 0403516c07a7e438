pub const STARTER: &str = include_str!("../../scenarios/starter.toml");
