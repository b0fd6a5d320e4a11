//! The valve columns of a cylinder (migration 0007): the load-holding valve on its holding end
//! and the directional valve's centre at each work port. `None`: not recorded.

use crate::calc::valves::Valves;
use serde::Serialize;
use sqlx::SqliteConnection;

/// A cylinder's recorded valves, as stored (SI; words as in `calc::valves`).
#[derive(Clone, Debug, Default, PartialEq, Serialize, sqlx::FromRow)]
pub struct ValveFields {
    /// `counterbalance` or `pilot_check`.
    pub holding_valve: Option<String>,
    pub holding_valve_setting_pa: Option<f64>,
    pub holding_valve_pilot_ratio: Option<f64>,
    /// `other_port` or `external`.
    pub holding_valve_pilot: Option<String>,
    /// `blocked` or `open_to_tank`.
    pub cap_port_centre: Option<String>,
    pub rod_port_centre: Option<String>,
}

impl ValveFields {
    /// The engineering core's valves for these stored words ([`Valves::from_words`]).
    pub fn calc(&self) -> Valves {
        Valves::from_words(
            self.holding_valve.as_deref(),
            self.holding_valve_setting_pa,
            self.holding_valve_pilot_ratio,
            self.holding_valve_pilot.as_deref(),
            self.cap_port_centre.as_deref(),
            self.rod_port_centre.as_deref(),
        )
    }
}

/// Writes the valve columns of cylinder `id` (inside the caller's write transaction).
pub async fn write(
    conn: &mut SqliteConnection,
    id: i64,
    v: &ValveFields,
) -> Result<(), sqlx::Error> {
    sqlx::query(
        "UPDATE cylinders SET holding_valve = ?, holding_valve_setting_pa = ?,
            holding_valve_pilot_ratio = ?, holding_valve_pilot = ?, cap_port_centre = ?,
            rod_port_centre = ?
         WHERE id = ?",
    )
    .bind(&v.holding_valve)
    .bind(v.holding_valve_setting_pa)
    .bind(v.holding_valve_pilot_ratio)
    .bind(&v.holding_valve_pilot)
    .bind(&v.cap_port_centre)
    .bind(&v.rod_port_centre)
    .bind(id)
    .execute(conn)
    .await?;
    Ok(())
}
