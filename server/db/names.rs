//! Unit numbers, serials and site names as people read them. Stored text is NFKC-normalised
//! (full-width digits become digits, compatibility forms their plain letters) and trimmed;
//! control, invisible-format and bidirectional-override characters are refused, since they
//! change what is shown without changing what is read aloud. Two unit numbers (or site names)
//! are the same when their keys match: NFKC, letter case, separators (`-`, spaces, dots, any
//! Unicode dash) set aside, and look-alike characters mapped to one skeleton (the confusables
//! of Unicode Technical Standard #39, via the unicode-security crate). The unit search uses the
//! same key.

use super::write::WriteError;
use sqlx::SqliteConnection;
use unicode_normalization::UnicodeNormalization;

/// `text` as stored: NFKC, trimmed. Refuses control and format characters (zero-width spaces,
/// bidirectional overrides and isolates, byte-order marks) with a message naming the first.
pub fn clean(text: &str) -> Result<String, String> {
    let normal: String = text.nfkc().collect();
    let normal = normal.trim();
    if let Some((at, c)) = normal.chars().enumerate().find(|(_, c)| hidden(*c)) {
        return Err(format!(
            "contains an invisible or control character (U+{:04X} at position {}); type the \
             text again without it",
            c as u32,
            at + 1
        ));
    }
    Ok(normal.to_string())
}

/// Control characters (Cc) and the format characters (Cf) that change display: zero-width
/// space and joiners, word joiner, the bidirectional marks, embeddings, overrides and isolates,
/// the byte-order mark, the Arabic letter mark.
fn hidden(c: char) -> bool {
    c.is_control()
        || matches!(c,
            '\u{00AD}' | '\u{061C}' | '\u{180E}' | '\u{200B}'..='\u{200F}' | '\u{202A}'..='\u{202E}'
            | '\u{2060}'..='\u{2064}' | '\u{2066}'..='\u{2069}' | '\u{FEFF}')
}

/// The comparison key: NFKC, letters and digits only (separators dropped), the UTS #39
/// skeleton (look-alikes mapped together) taken before and after lower-casing (so a Cyrillic
/// capital EN meets the Latin H, and case is ignored), lower case. Capital I, small l and the
/// digit 1 share a skeleton; small i joins them, or `HV-I5` and `hv-i5` would differ.
pub fn key(text: &str) -> String {
    let plain: String = text.nfkc().filter(|c| c.is_alphanumeric()).collect();
    let once: String = unicode_security::skeleton(&plain)
        .flat_map(char::to_lowercase)
        .collect();
    unicode_security::skeleton(&once)
        .flat_map(char::to_lowercase)
        .filter(|c| c.is_alphanumeric())
        .map(|c| if c == 'i' { 'l' } else { c })
        .collect()
}

/// True when a search text reads as (part of) a unit number: letters, digits, spaces, dots,
/// slashes and dashes only. Only such a text is also matched by key, so that a search for
/// `100%` or `_X` keeps its literal meaning.
pub fn looks_like_unit(text: &str) -> bool {
    text.nfkc().all(|c| {
        c.is_alphanumeric()
            || c.is_whitespace()
            || matches!(c, '-' | '.' | '/' | '\u{2010}'..='\u{2015}' | '\u{2212}')
    })
}

/// Refuses a unit number whose key matches another machine's (`except`: the machine being
/// changed), naming the registered unit.
pub async fn check_unit(
    conn: &mut SqliteConnection,
    except: Option<i64>,
    unit_number: &str,
) -> Result<(), WriteError> {
    let found: Option<String> = sqlx::query_scalar(
        "SELECT unit_number FROM machines WHERE unit_key = ? AND id <> ? ORDER BY id LIMIT 1",
    )
    .bind(key(unit_number))
    .bind(except.unwrap_or(0))
    .fetch_optional(&mut *conn)
    .await?;
    match found {
        None => Ok(()),
        Some(existing) => Err(WriteError::conflict(
            "unit_number",
            clash("unit number", unit_number, &existing),
        )),
    }
}

/// Refuses a site name whose key matches another site's, naming it.
pub async fn check_site(
    conn: &mut SqliteConnection,
    except: Option<i64>,
    name: &str,
) -> Result<(), WriteError> {
    let found: Option<String> = sqlx::query_scalar(
        "SELECT name FROM sites WHERE name_key = ? AND id <> ? ORDER BY id LIMIT 1",
    )
    .bind(key(name))
    .bind(except.unwrap_or(0))
    .fetch_optional(&mut *conn)
    .await?;
    match found {
        None => Ok(()),
        Some(existing) => Err(WriteError::conflict("name", clash("site", name, &existing))),
    }
}

fn clash(what: &str, given: &str, existing: &str) -> String {
    if given == existing {
        format!("{what} \"{existing}\" is already registered")
    } else {
        format!(
            "{what} \"{given}\" reads as the registered {what} \"{existing}\" (the same once \
             letter case, separators and look-alike characters are set aside); use that one or \
             choose a clearly different {what}"
        )
    }
}

/// Stores the key of a machine's unit number (after an insert or a change).
pub async fn store_unit_key(conn: &mut SqliteConnection, id: i64) -> Result<(), sqlx::Error> {
    let unit: String = sqlx::query_scalar("SELECT unit_number FROM machines WHERE id = ?")
        .bind(id)
        .fetch_one(&mut *conn)
        .await?;
    sqlx::query("UPDATE machines SET unit_key = ? WHERE id = ?")
        .bind(key(&unit))
        .bind(id)
        .execute(&mut *conn)
        .await?;
    Ok(())
}

/// Stores the key of a site's name.
pub async fn store_site_key(conn: &mut SqliteConnection, id: i64) -> Result<(), sqlx::Error> {
    let name: String = sqlx::query_scalar("SELECT name FROM sites WHERE id = ?")
        .bind(id)
        .fetch_one(&mut *conn)
        .await?;
    sqlx::query("UPDATE sites SET name_key = ? WHERE id = ?")
        .bind(key(&name))
        .bind(id)
        .execute(&mut *conn)
        .await?;
    Ok(())
}

/// Fills the keys of rows stored before keys existed (run once the migrations are applied).
pub async fn backfill(db: &super::Db) -> Result<(), sqlx::Error> {
    let machines: Vec<i64> = sqlx::query_scalar("SELECT id FROM machines WHERE unit_key IS NULL")
        .fetch_all(db)
        .await?;
    let sites: Vec<i64> = sqlx::query_scalar("SELECT id FROM sites WHERE name_key IS NULL")
        .fetch_all(db)
        .await?;
    if machines.is_empty() && sites.is_empty() {
        return Ok(());
    }
    let (_write, mut tx) = super::begin_write(db).await?;
    for id in machines {
        store_unit_key(&mut tx, id).await?;
    }
    for id in sites {
        store_site_key(&mut tx, id).await?;
    }
    tx.commit().await
}
