//! The `loadhold user add` and `loadhold token create` commands.

use super::{Actor, Role, password, tokens, users};
use crate::db::Db;
use std::io::{IsTerminal, Read};

fn parse_role(text: &str) -> Result<Role, String> {
    Role::parse(text.trim())
        .ok_or_else(|| format!("unknown role \"{text}\": use technician, manager or admin"))
}

/// The password piped on standard input (first line), or `None` when standard input is a
/// terminal or empty.
fn password_from_stdin() -> Result<Option<String>, String> {
    let stdin = std::io::stdin();
    if stdin.is_terminal() {
        return Ok(None);
    }
    let mut text = String::new();
    stdin
        .lock()
        .read_to_string(&mut text)
        .map_err(|e| format!("cannot read the password from standard input: {e}"))?;
    let first = text.lines().next().unwrap_or("").trim_end_matches('\r');
    Ok(Some(first.to_string()).filter(|p| !p.is_empty()))
}

/// `loadhold user add NAME --role ROLE [--display-name TEXT]`: the password comes from
/// standard input, or is generated and printed once. Returns what to print.
pub async fn user_add(
    db: &Db,
    username: &str,
    role: &str,
    display_name: Option<&str>,
) -> Result<String, String> {
    let role = parse_role(role)?;
    let (secret, generated) = match password_from_stdin()? {
        Some(given) => (given, false),
        None => (password::generate().map_err(|e| e.to_string())?, true),
    };
    let user = users::create(
        db,
        &Actor::system(),
        username,
        display_name.unwrap_or(""),
        role,
        &secret,
    )
    .await
    .map_err(|e| format!("cannot add user {username}: {e}"))?;
    let mut out = format!(
        "added user {} ({}) as {}",
        user.username, user.display_name, user.role
    );
    if generated {
        out.push_str(&format!("\npassword (shown once, store it now): {secret}"));
    }
    Ok(out)
}

/// An expiry date `YYYY-MM-DD` as the time the token stops: the start of that day, UTC.
pub fn expiry(text: &str) -> Result<String, String> {
    let day = crate::api::input::parse_date(text)
        .ok_or_else(|| format!("write the expiry as a date YYYY-MM-DD, not \"{text}\""))?;
    Ok(format!("{}T00:00:00Z", crate::api::draft::date_text(day)))
}

/// `loadhold token create NAME [--owner USER] [--role ROLE] [--expires YYYY-MM-DD]`: returns
/// the token, to print once. Without `--owner` the token belongs to the service account
/// `cli-tokens` (made on first use, cannot log in); the role defaults to technician and may
/// not be above the owner's.
pub async fn token_create(
    db: &Db,
    name: &str,
    role: Option<&str>,
    owner: Option<&str>,
    expires: Option<&str>,
) -> Result<String, String> {
    let role = parse_role(role.unwrap_or("technician"))?;
    let expires = expires.map(expiry).transpose()?;
    let owner_id = match owner {
        Some(owner) => user_named(db, owner).await?.id,
        None => tokens::cli_owner(db)
            .await
            .map_err(|e| format!("cannot make the {} account: {e}", tokens::CLI_OWNER))?,
    };
    let (stored, token) = tokens::create_owned(
        db,
        &Actor::system(),
        name,
        role,
        owner_id,
        expires.as_deref(),
    )
    .await
    .map_err(|e| format!("cannot create token {name}: {e}"))?;
    eprintln!(
        "token \"{}\" ({}, owned by {}) created; it is shown once, store it now:",
        stored.name,
        stored.role,
        stored.owner.as_deref().unwrap_or("nobody")
    );
    Ok(token)
}

async fn user_named(db: &Db, username: &str) -> Result<users::User, String> {
    users::by_username(db, username)
        .await
        .map_err(|e| format!("cannot read users: {e}"))?
        .ok_or_else(|| format!("there is no user {username}"))
}

/// `loadhold user unlock NAME`: clears the locks failed logins put on the account.
pub async fn user_unlock(db: &Db, username: &str) -> Result<String, String> {
    let user = user_named(db, username).await?;
    users::unlock(db, &Actor::system(), user.id)
        .await
        .map_err(|e| format!("cannot unlock {username}: {e}"))?;
    Ok(format!(
        "unlocked {}: failed logins so far no longer count",
        user.username
    ))
}

/// `loadhold user disable NAME`: the user can no longer log in; their sessions end and the
/// tokens they own stop working.
pub async fn user_disable(db: &Db, username: &str) -> Result<String, String> {
    let user = user_named(db, username).await?;
    users::change(db, &Actor::system(), user.id, users::Change::Disable)
        .await
        .map_err(|e| format!("cannot disable {username}: {e}"))?;
    Ok(format!(
        "disabled {}: their sessions have ended and their tokens are refused",
        user.username
    ))
}
