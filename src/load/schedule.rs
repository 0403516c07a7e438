//! Occupancy schedules: 24 hourly fractions for weekdays and for weekends.
//!
//! A fraction of 0 means the building is unoccupied in that hour (set-backs apply, ventilation
//! and scheduled gains are off); any fraction above 0 means occupied, and scheduled gains and
//! ventilation are scaled by it.

use crate::error::Result;
use crate::validate;

/// Hourly occupancy fractions for a weekday and a weekend day.
#[derive(Debug, Clone, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DaySchedule {
    /// 24 fractions 0..=1, Monday to Friday; index 0 is the hour 00:00–01:00.
    pub weekday: Vec<f64>,
    /// 24 fractions 0..=1, Saturday and Sunday.
    pub weekend: Vec<f64>,
}

impl DaySchedule {
    /// Check both lists: exactly 24 values, each between 0 and 1.
    ///
    /// Keys are `weekday` / `weekend` (`weekday[7]` for a single value); the scenario layer
    /// prefixes the section with [`crate::Error::within`].
    pub fn validate(&self) -> Result<()> {
        validate::list(
            "weekday",
            &self.weekday,
            24,
            0.0,
            1.0,
            "hourly occupancy fraction Monday–Friday, hour 0 = 00:00–01:00",
        )?;
        validate::list(
            "weekend",
            &self.weekend,
            24,
            0.0,
            1.0,
            "hourly occupancy fraction Saturday–Sunday, hour 0 = 00:00–01:00",
        )
    }

    /// Fraction (0..=1) at `hour_of_day` (0..=23) on `weekday` (0 = Monday ..= 6 = Sunday;
    /// 5 and 6 use the weekend list).
    ///
    /// Out-of-range hour or weekday (or a schedule that failed [`DaySchedule::validate`])
    /// gives 0 rather than a panic; callers validate first.
    pub fn at(&self, hour_of_day: u32, weekday: u32) -> f64 {
        let list = if weekday % 7 >= 5 {
            &self.weekend
        } else {
            &self.weekday
        };
        list.get(hour_of_day as usize).copied().unwrap_or(0.0)
    }

    /// A schedule occupied (fraction 1) from `start_h` to `end_h` (end exclusive) on the days
    /// selected, 0 otherwise.
    fn block(start_h: usize, end_h: usize, weekends: bool) -> Self {
        let day: Vec<f64> = (0..24)
            .map(|h| if h >= start_h && h < end_h { 1.0 } else { 0.0 })
            .collect();
        DaySchedule {
            weekday: day.clone(),
            weekend: if weekends { day } else { vec![0.0; 24] },
        }
    }
}

/// Demo office schedule (demo values, typical of the class, common practice): occupied
/// 08:00–18:00 Monday to Friday at fraction 1, unoccupied at night and at weekends.
pub fn office() -> DaySchedule {
    DaySchedule::block(8, 18, false)
}

/// Demo clinic schedule (demo values, typical of the class, common practice): occupied
/// 07:00–20:00 every day of the week at fraction 1.
pub fn clinic() -> DaySchedule {
    DaySchedule::block(7, 20, true)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn office_hours() {
        let s = office();
        s.validate().unwrap();
        // Monday 07:00–08:00 empty, 08:00–09:00 occupied, 17:00–18:00 occupied, 18:00 empty.
        assert_eq!(s.at(7, 0), 0.0);
        assert_eq!(s.at(8, 0), 1.0);
        assert_eq!(s.at(17, 4), 1.0);
        assert_eq!(s.at(18, 4), 0.0);
        // Saturday and Sunday empty.
        assert_eq!(s.at(10, 5), 0.0);
        assert_eq!(s.at(10, 6), 0.0);
        // 10 occupied hours a weekday, 50 a week.
        let week: f64 = (0..7)
            .flat_map(|d| (0..24).map(move |h| (h, d)))
            .map(|(h, d)| s.at(h, d))
            .sum();
        assert_eq!(week, 50.0);
    }

    #[test]
    fn clinic_every_day() {
        let s = clinic();
        s.validate().unwrap();
        assert_eq!(s.at(7, 6), 1.0);
        assert_eq!(s.at(19, 5), 1.0);
        assert_eq!(s.at(20, 2), 0.0);
        assert_eq!(s.at(6, 2), 0.0);
    }

    #[test]
    fn fractions_and_weekday_selection() {
        let mut s = office();
        s.weekday[12] = 0.5;
        s.weekend[12] = 0.25;
        assert_eq!(s.at(12, 3), 0.5);
        assert_eq!(s.at(12, 6), 0.25);
        // Out-of-range hour is 0, not a panic.
        assert_eq!(s.at(24, 0), 0.0);
    }

    #[test]
    fn twenty_three_values_rejected() {
        let mut s = office();
        s.weekday.pop();
        let e = s.validate().unwrap_err().to_string();
        assert!(e.contains("weekday"), "{e}");
        assert!(e.contains("exactly 24"), "{e}");
    }

    #[test]
    fn fraction_above_one_rejected() {
        let mut s = clinic();
        s.weekend[3] = 1.5;
        let e = s.validate().unwrap_err().to_string();
        assert!(e.contains("weekend[3]"), "{e}");
    }
}
