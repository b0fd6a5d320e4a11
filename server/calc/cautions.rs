//! The standard caution texts shown wherever a result can hurt someone. Our own wording of the
//! usual shop cautions; they defer to the manufacturer, local codes and qualified persons.

/// Support or lower the load first.
pub const SUPPORT_LOAD: &str = "Support the load mechanically or lower it to the ground before you open any port, loosen any fitting or remove any valve.";

/// Relieve trapped pressure.
pub const RELIEVE_PRESSURE: &str = "Oil trapped in a cylinder and its lines keeps its pressure after the engine stops. Relieve it by a controlled method before work; with a passing piston seal, expect pressure in both ends.";

/// Never feel for leaks by hand.
pub const NO_HANDS: &str = "Never feel for a leak with your hand: a fine jet of oil can pierce the skin (injection injury). Use cardboard or wood, wear eye protection, and get medical help at once if oil enters the skin.";

/// Follow lockout practice.
pub const LOCKOUT: &str = "Follow lockout practice: stop the machine, remove the key, tag the controls and prove that nothing can move before you start.";

/// Defer to the manufacturer and qualified persons.
pub const DEFER: &str = "These figures support judgement and do not replace it. Follow the manufacturer's instructions, local codes and the advice of qualified persons.";

/// Said when a pressure may be above a rating.
pub const OVER_RATING: &str = "A line, hose or the cylinder may be above its rated pressure. Keep people away from it, add no load, and have the fault repaired before the machine works again.";

/// Said when a blocked end can rise above the machine's relief setting.
pub const ABOVE_RELIEF: &str = "A blocked end can rise above the machine's relief setting, and the relief valve cannot limit it there. Check that every line, hose and fitting on that end, and the cylinder itself, is rated for that pressure; where a rating is not known, treat the part as not rated for it.";

/// Said when the load can run away.
pub const RUNAWAY: &str = "This cylinder may not hold its load: keep everyone out from under and beside the load and block it mechanically until the cylinder is repaired.";

/// The five standard cautions, always shown.
pub const STANDARD: [&str; 5] = [SUPPORT_LOAD, RELIEVE_PRESSURE, NO_HANDS, LOCKOUT, DEFER];

/// The cautions for a result: the specific ones first (`over_rating`: some pressure is above
/// or near a rating; `runaway`: the load can move by itself), then the standard five.
pub fn for_result(over_rating: bool, runaway: bool) -> Vec<&'static str> {
    let mut out = Vec::with_capacity(7);
    if runaway {
        out.push(RUNAWAY);
    }
    if over_rating {
        out.push(OVER_RATING);
    }
    out.extend_from_slice(&STANDARD);
    out
}
