//! Due dates by days and by hours, whichever comes first (`server/calc/due.rs`).
//!
//! Context only: OSHA 29 CFR 1910.179(j) puts frequent inspections at daily to monthly and
//! periodic ones at 1 to 12 months [S, REFERENCES.md "Inspection practice"]; the intervals
//! below sit in those ranges. The checks themselves are calendar arithmetic in the proleptic
//! Gregorian calendar, worked by hand beside each ([C]; the day counts were also checked with
//! Python's `datetime`, a general-purpose library, when the tests were written).

use loadhold::calc::due::{
    self, Baseline, Basis, Due, HoseReason, Interval, Reading, Window, next_due,
};
use time::Date;
use time::macros::date;

const MONTH_WINDOW: Window = Window {
    days: 30,
    hours: None,
};

fn since(on: Date, hours: Option<f64>) -> Baseline {
    Baseline {
        on,
        hour_meter: hours,
    }
}

fn read(hours: f64, on: Date) -> Option<Reading> {
    Some(Reading { hours, on })
}

fn days(d: i64) -> Interval {
    Interval {
        days: Some(d),
        hours: None,
    }
}

fn due(interval: Interval, base: Baseline, reading: Option<Reading>, as_of: Date) -> Due {
    next_due(interval, base, reading, as_of, MONTH_WINDOW).expect("a scheduled kind")
}

#[test]
fn a_yearly_periodic_inspection_is_due_on_the_same_day_next_year() {
    // [C] 2024-03-15 + 365 days: the year to 2025-03-15 holds no 29 February, so 365 days.
    let d = due(
        days(365),
        since(date!(2024 - 03 - 15), None),
        None,
        date!(2025 - 01 - 01),
    );
    assert_eq!(d.due_on, Some(date!(2025 - 03 - 15)));
    assert_eq!(d.due_at_hours, None);
    assert_eq!(d.basis, Basis::Date);
    assert!(!d.overdue && !d.due_soon);
}

#[test]
fn day_intervals_cross_a_leap_february() {
    // [C] 2024-01-31 + 30 days: 29 days of February 2024 reach 02-29, one more is 03-01.
    let d = due(
        days(30),
        since(date!(2024 - 01 - 31), None),
        None,
        date!(2024 - 01 - 31),
    );
    assert_eq!(d.due_on, Some(date!(2024 - 03 - 01)));
}

#[test]
fn due_on_the_day_is_not_yet_overdue_and_the_next_day_is() {
    // [C] 2025-01-01 + 180 days = 2025-06-30 (31 + 28 + 31 + 30 + 31 = 151 to 06-01, + 29).
    let base = since(date!(2025 - 01 - 01), None);
    let on_the_day = due(days(180), base, None, date!(2025 - 06 - 30));
    assert_eq!(on_the_day.due_on, Some(date!(2025 - 06 - 30)));
    assert!(!on_the_day.overdue);
    assert!(on_the_day.due_soon);
    assert_eq!(on_the_day.days_overdue, Some(0));
    let day_after = due(days(180), base, None, date!(2025 - 07 - 01));
    assert!(day_after.overdue);
    assert!(
        !day_after.due_soon,
        "an overdue item is not also 'due soon'"
    );
    assert_eq!(day_after.days_overdue, Some(1));
    assert_eq!(day_after.lateness_days, Some(1.0));
}

#[test]
fn the_window_reaches_as_of_plus_within_days_inclusive() {
    // [C] due 2025-06-30; as of 2025-05-31 + 30 days = 2025-06-30 (inside); as of 05-30 the
    // horizon is 06-29 (outside). Days left: 30 and 31.
    let base = since(date!(2025 - 01 - 01), None);
    let inside = due(days(180), base, None, date!(2025 - 05 - 31));
    assert!(inside.due_soon && !inside.overdue);
    assert_eq!(inside.days_overdue, Some(-30));
    let outside = due(days(180), base, None, date!(2025 - 05 - 30));
    assert!(!outside.due_soon && !outside.overdue && !outside.is_listed());
    assert_eq!(outside.days_overdue, Some(-31));
}

#[test]
fn never_done_is_due_on_the_registration_date_itself() {
    // The rule: a machine or cylinder never inspected or tested is due from the day it
    // was registered. [C] registered 2025-02-10, as of 2025-02-13: 3 days overdue, by date.
    let window = loadhold::calc::due::Window {
        days: 30,
        hours: None,
    };
    let d = loadhold::calc::due::first_due(
        days(90),
        date!(2025 - 02 - 10),
        date!(2025 - 02 - 13),
        window,
    )
    .expect("scheduled");
    assert_eq!(d.due_on, Some(date!(2025 - 02 - 10)));
    assert_eq!(d.due_at_hours, None);
    assert!(d.overdue);
    assert_eq!(d.days_overdue, Some(3));
    // Not scheduled at all: never due.
    let unset = loadhold::calc::due::Interval::default();
    assert!(
        loadhold::calc::due::first_due(unset, date!(2025 - 02 - 10), date!(2025 - 02 - 13), window)
            .is_none()
    );
}

#[test]
fn an_interval_counted_from_a_given_day_lands_on_the_calendar_day() {
    // [C] from 2025-02-10, every 90 days: 18 days to 02-28, 31 to 03-31, 30 to 04-30,
    // 11 to 05-11 = 90.
    let d = due(
        days(90),
        since(date!(2025 - 02 - 10), None),
        None,
        date!(2025 - 05 - 12),
    );
    assert_eq!(d.due_on, Some(date!(2025 - 05 - 11)));
    assert!(d.overdue);
    assert_eq!(d.days_overdue, Some(1));
}

#[test]
fn hours_past_the_limit_make_it_overdue_by_hours_before_the_date() {
    // Last periodic 2025-01-10 at 1200 h, every 365 days or 500 h. Read 1750 h on 2025-03-01.
    // [C] due at 1200 + 500 = 1700 h, 50 h past. Rate 550 h over 50 days (21 + 28 + 1) =
    // 11 h/day; the limit fell 500 / 11 = 45.45 days after 01-10; as of 2025-03-10 (59 days
    // after) that is 59 - 45.45 = 13.55 days late. The date 2026-01-10 is still 306 days off.
    let interval = Interval {
        days: Some(365),
        hours: Some(500.0),
    };
    let base = since(date!(2025 - 01 - 10), Some(1200.0));
    let d = due(
        interval,
        base,
        read(1750.0, date!(2025 - 03 - 01)),
        date!(2025 - 03 - 10),
    );
    assert_eq!(d.due_on, Some(date!(2026 - 01 - 10)));
    assert_eq!(d.due_at_hours, Some(1700.0));
    assert_eq!(d.basis, Basis::Hours);
    assert!(d.overdue);
    assert_eq!(d.hours_overdue, Some(50.0));
    assert_eq!(d.days_overdue, Some(-306));
    let late = d.lateness_days.expect("estimated from the use rate");
    assert!(
        (late - (59.0 - 500.0 / 11.0)).abs() < 1e-9,
        "lateness {late}"
    );
}

#[test]
fn whichever_comes_first_picks_hours_when_the_meter_will_get_there_sooner() {
    // Last 2025-01-01 at 1000 h, every 180 days or 250 h; read 1100 h on 2025-03-01 (59 days).
    // [C] rate 100/59 h/day: 250 h take 147.5 days, before the 180 days (due 2025-06-30), so
    // the hours come first. Not overdue: 1100 < 1250 h, and 2025-03-01 < 2025-06-30.
    let interval = Interval {
        days: Some(180),
        hours: Some(250.0),
    };
    let base = since(date!(2025 - 01 - 01), Some(1000.0));
    let d = due(
        interval,
        base,
        read(1100.0, date!(2025 - 03 - 01)),
        date!(2025 - 03 - 01),
    );
    assert_eq!(d.basis, Basis::Hours);
    assert!(!d.overdue && !d.due_soon);
    assert_eq!(d.due_at_hours, Some(1250.0));
    assert_eq!(d.hours_overdue, Some(-150.0));
    assert_eq!(d.days_overdue, Some(-121));
    let late = d.lateness_days.expect("estimate");
    assert!((late - (59.0 - 147.5)).abs() < 1e-9, "lateness {late}");

    // A slow meter: 20 h in the same 59 days, so 250 h would take 737.5 days: the date wins.
    let slow = due(
        interval,
        base,
        read(1020.0, date!(2025 - 03 - 01)),
        date!(2025 - 03 - 01),
    );
    assert_eq!(slow.basis, Basis::Date);
    assert_eq!(slow.lateness_days, Some(-121.0));
}

#[test]
fn overdue_by_date_names_the_date_even_when_hours_would_be_next() {
    // Every 30 days or 100 h from 2025-01-01 at 0 h; read 90 h on 2025-01-20. As of
    // 2025-02-05 the date (2025-01-31) is 5 days past; 90 < 100 h is not past.
    let interval = Interval {
        days: Some(30),
        hours: Some(100.0),
    };
    let d = due(
        interval,
        since(date!(2025 - 01 - 01), Some(0.0)),
        read(90.0, date!(2025 - 01 - 20)),
        date!(2025 - 02 - 05),
    );
    assert_eq!(d.due_on, Some(date!(2025 - 01 - 31)));
    assert!(d.overdue);
    assert_eq!(d.basis, Basis::Date);
    assert_eq!(d.days_overdue, Some(5));
}

#[test]
fn a_window_in_hours_catches_an_item_close_on_the_meter() {
    // Due at 1200 + 500 = 1700 h; the meter reads 1650 h: within 50 h (1650 + 50 >= 1700),
    // not within 49 h. The window in days alone does not reach the date (2026-01-10).
    let interval = Interval {
        days: Some(365),
        hours: Some(500.0),
    };
    let base = since(date!(2025 - 01 - 10), Some(1200.0));
    let reading = read(1650.0, date!(2025 - 03 - 01));
    let window = |hours| Window {
        days: 30,
        hours: Some(hours),
    };
    let near = next_due(interval, base, reading, date!(2025 - 03 - 01), window(50.0)).unwrap();
    assert!(near.due_soon && !near.overdue);
    let far = next_due(interval, base, reading, date!(2025 - 03 - 01), window(49.0)).unwrap();
    assert!(!far.due_soon && !far.overdue);
}

#[test]
fn never_done_by_hours_counts_from_zero_on_the_meter() {
    // Registered 2025-02-10 with 5000 h on the meter and no record: every 250 h counts from
    // 0 h (module rule), so it is due at 250 h and 4750 h past; the limit was passed by the
    // reading on 02-10, so as of 02-20 it is at least 10 days late.
    let interval = Interval {
        days: None,
        hours: Some(250.0),
    };
    let d = due(
        interval,
        since(date!(2025 - 02 - 10), None),
        read(5000.0, date!(2025 - 02 - 10)),
        date!(2025 - 02 - 20),
    );
    assert_eq!(d.due_on, None);
    assert_eq!(d.due_at_hours, Some(250.0));
    assert_eq!(d.basis, Basis::Hours);
    assert!(d.overdue);
    assert_eq!(d.hours_overdue, Some(4750.0));
    assert_eq!(d.lateness_days, Some(10.0));
}

#[test]
fn an_hours_only_interval_without_a_reading_is_not_overdue() {
    let interval = Interval {
        days: None,
        hours: Some(250.0),
    };
    let d = due(
        interval,
        since(date!(2025 - 02 - 10), Some(100.0)),
        None,
        date!(2030 - 01 - 01),
    );
    assert_eq!(d.due_at_hours, Some(350.0));
    assert!(!d.overdue && !d.due_soon);
    assert_eq!(d.hours_overdue, None);
    assert_eq!(d.lateness_days, None);
}

#[test]
fn an_unscheduled_kind_has_no_due_point() {
    let none = next_due(
        Interval::default(),
        since(date!(2025 - 01 - 01), None),
        None,
        date!(2025 - 01 - 01),
        MONTH_WINDOW,
    );
    assert!(none.is_none());
}

#[test]
fn calendar_years_fall_back_from_29_february() {
    // [C] 2024 is a leap year, 2025 is not, 2028 is.
    assert_eq!(
        due::add_years(date!(2024 - 02 - 29), 1),
        Some(date!(2025 - 02 - 28))
    );
    assert_eq!(
        due::add_years(date!(2024 - 02 - 29), 4),
        Some(date!(2028 - 02 - 29))
    );
    assert_eq!(
        due::add_years(date!(2019 - 07 - 01), 6),
        Some(date!(2025 - 07 - 01))
    );
}

#[test]
fn manufacture_dates_read_as_the_first_day_of_the_period() {
    assert_eq!(due::parse_made_in("2019-Q3"), Some(date!(2019 - 07 - 01)));
    assert_eq!(due::parse_made_in("2019-q4"), Some(date!(2019 - 10 - 01)));
    assert_eq!(due::parse_made_in("2021-05"), Some(date!(2021 - 05 - 01)));
    assert_eq!(
        due::parse_made_in("2021-05-17"),
        Some(date!(2021 - 05 - 17))
    );
    assert_eq!(due::parse_made_in("2020"), Some(date!(2020 - 01 - 01)));
    for bad in [
        "2019-Q5",
        "2019-Q0",
        "2021-13",
        "2021-02-30",
        "Q3 2019",
        "",
        "soon",
    ] {
        assert_eq!(due::parse_made_in(bad), None, "{bad:?}");
    }
}

#[test]
fn a_hose_is_due_at_the_earlier_of_replace_by_and_its_age_limit() {
    // Made 2019-Q3 (2019-07-01); a shop limit of 6 years (our example setting, not a
    // standard: ISO/TS 17165-2 sets no fixed interval, REFERENCES.md) gives 2025-07-01,
    // before a replace-by of 2026-01-01.
    let made = due::parse_made_in("2019-Q3");
    assert_eq!(
        due::hose_due(Some(date!(2026 - 01 - 01)), made, Some(6)),
        Some((date!(2025 - 07 - 01), HoseReason::AgeLimit))
    );
    assert_eq!(
        due::hose_due(Some(date!(2024 - 01 - 01)), made, Some(6)),
        Some((date!(2024 - 01 - 01), HoseReason::ReplaceBy))
    );
    assert_eq!(
        due::hose_due(None, made, None),
        None,
        "no replace-by and no age limit: nothing due"
    );
    assert_eq!(
        due::hose_due(Some(date!(2025 - 07 - 01)), made, Some(6)),
        Some((date!(2025 - 07 - 01), HoseReason::ReplaceBy)),
        "a tie names the replace-by date"
    );
}

#[test]
fn a_plain_date_is_overdue_the_day_after() {
    let d = due::by_date(date!(2025 - 07 - 01), date!(2025 - 07 - 02), 30);
    assert!(d.overdue);
    assert_eq!(d.days_overdue, Some(1));
    let soon = due::by_date(date!(2025 - 07 - 01), date!(2025 - 06 - 01), 30);
    assert!(soon.due_soon && !soon.overdue, "06-01 + 30 days = 07-01");
    assert_eq!(
        due::age_days(date!(2019 - 07 - 01), date!(2025 - 07 - 01)),
        2192
    );
}

#[test]
fn lists_sort_the_furthest_overdue_first_then_due_soon_then_the_rest() {
    let as_of = date!(2025 - 06 - 01);
    let mut items = [
        due::by_date(date!(2025 - 12 - 01), as_of, 30), // not due
        due::by_date(date!(2025 - 06 - 20), as_of, 30), // due soon
        due::by_date(date!(2025 - 05 - 30), as_of, 30), // 2 days over
        due::by_date(date!(2025 - 03 - 03), as_of, 30), // 90 days over
        due::by_date(date!(2025 - 06 - 05), as_of, 30), // due soon, sooner
    ];
    items.sort_by(due::most_overdue_first);
    let order: Vec<_> = items.iter().map(|d| d.days_overdue.unwrap()).collect();
    // [C] 03-03 to 06-01: 28 + 30 + 31 + 1 = 90 days.
    assert_eq!(order, vec![90, 2, -4, -19, -183]);
}

#[test]
fn stored_dates_and_timestamps_read_as_their_calendar_day() {
    assert_eq!(due::parse_day("2025-06-01"), Some(date!(2025 - 06 - 01)));
    assert_eq!(
        due::parse_day("2025-06-01T23:59:59Z"),
        Some(date!(2025 - 06 - 01))
    );
    for bad in [
        "2025-6-1",
        "2025-02-30",
        "+202-06-01",
        "June 2025",
        "",
        "2025-06",
    ] {
        assert_eq!(due::parse_day(bad), None, "{bad:?}");
    }
}
