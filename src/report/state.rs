//! The `parhelion state` verb's output: one state point, as aligned text or one JSON object
//! whose keys name quantity and unit.

use serde_json::{Map, Value};

/// One quantity: JSON key (quantity and unit), label, value (`None` = not defined).
pub struct Quantity {
    pub key: &'static str,
    pub label: &'static str,
    pub value: Option<f64>,
}

/// Aligned `label  value` lines, under a title line.
pub fn render_text(title: &str, q: &[Quantity]) -> String {
    let w = q.iter().map(|x| x.label.chars().count()).max().unwrap_or(0);
    let mut s = format!("{title}\n");
    for x in q {
        let v = x.value.map_or("–".to_string(), |v| {
            if v != 0.0 && (v.abs() < 1e-3 || v.abs() >= 1e6) {
                format!("{v:.6e}")
            } else {
                format!("{v:.6}")
            }
        });
        s.push_str(&format!("  {:<w$}  {v}\n", x.label));
    }
    s
}

/// One JSON object; undefined quantities are `null`. `extra` adds text fields first.
pub fn render_json(extra: &[(&str, &str)], q: &[Quantity]) -> String {
    let mut m = Map::new();
    for (k, v) in extra {
        m.insert((*k).to_string(), Value::String((*v).to_string()));
    }
    for x in q {
        m.insert(
            x.key.to_string(),
            x.value.map_or(Value::Null, |v| serde_json::json!(v)),
        );
    }
    format!("{}\n", Value::Object(m))
}
