//! The demo's accounts: one per role, with fixed passwords printed when the demo starts.
//! Invented people of the invented Harrow Vale Plant Hire yard.

use super::{Actor, Role, users};
use crate::db::Db;
use crate::db::write::WriteError;

/// One demo login.
#[derive(Clone, Copy, Debug)]
pub struct DemoLogin {
    pub username: &'static str,
    pub display_name: &'static str,
    pub role: Role,
    pub password: &'static str,
}

/// The demo logins: a technician, a manager and an admin. Demo only: never on a real server.
pub const DEMO_LOGINS: [DemoLogin; 3] = [
    DemoLogin {
        username: "tech",
        display_name: "Ellis Marsh",
        role: Role::Technician,
        password: "vale-tech-demo",
    },
    DemoLogin {
        username: "manager",
        display_name: "Rhiannon Cole",
        role: Role::Manager,
        password: "vale-manager-demo",
    },
    DemoLogin {
        username: "admin",
        display_name: "Sam Okafor",
        role: Role::Admin,
        password: "vale-admin-demo",
    },
];

/// Creates the demo users (skipping any that exist) and returns the lines to print.
pub async fn create_demo_users(db: &Db) -> Result<String, String> {
    let actor = Actor::system();
    let mut lines =
        vec!["Demo logins (demo passwords; never use them on a real server):".to_string()];
    for login in DEMO_LOGINS {
        match users::create(
            db,
            &actor,
            login.username,
            login.display_name,
            login.role,
            login.password,
        )
        .await
        {
            Ok(_) | Err(WriteError::Conflict { .. }) => {}
            Err(error) => {
                return Err(format!(
                    "cannot create demo user {}: {error}",
                    login.username
                ));
            }
        }
        lines.push(format!(
            "  {:<11} user {:<8} password {}",
            login.role.as_str(),
            login.username,
            login.password
        ));
    }
    Ok(lines.join("\n"))
}
