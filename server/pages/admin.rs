//! `/admin`: users (add, change role, disable, enable, set a new password) and API tokens
//! (create, shown once; revoke). Only admins reach these routes (see `auth::rules`).

use super::ctx::PageCtx;
use super::view::FieldErrors;
use crate::app::AppState;
use crate::auth::users::{self, Change};
use crate::auth::{Actor, Role, password, throttle, tokens};
use crate::db::write::WriteError;
use crate::error::AppError;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::{Form, Path, Query, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::{get, post};
use serde::Deserialize;

mod audit;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/admin", get(index))
        .route("/admin/users", post(add_user))
        .route("/admin/users/{id}/role", post(change_role))
        .route("/admin/users/{id}/disable", post(disable))
        .route("/admin/users/{id}/enable", post(enable))
        .route("/admin/users/{id}/password", post(new_password))
        .route("/admin/users/{id}/unlock", post(unlock))
        .route("/admin/tokens", post(create_token))
        .route("/admin/tokens/{id}/revoke", post(revoke_token))
        .merge(audit::router())
}

/// The role names, least trusted first, for the role choices.
pub const ROLES: [&str; 3] = ["technician", "manager", "admin"];

/// One user in the list.
pub struct UserRow {
    pub id: i64,
    pub username: String,
    pub display_name: String,
    pub role: String,
    pub created_at: String,
    pub disabled_at: String,
    /// The addresses failed logins locked this account at, comma-separated; empty when none.
    pub locked_from: String,
    /// The admin looking at the page.
    pub is_self: bool,
}

/// One token in the list (never the token itself).
pub struct TokenRow {
    pub id: i64,
    pub name: String,
    pub prefix: String,
    pub role: String,
    pub created_at: String,
    pub last_used_at: String,
    pub revoked_at: String,
    /// The user name of the account the token acts for.
    pub owner: String,
    /// When it stops working; empty: no expiry.
    pub expires_at: String,
}

/// A secret shown on this page once and never again.
pub struct ShownOnce {
    pub what: String,
    pub secret: String,
}

/// What was typed into the add-user and new-token forms, kept after a refusal.
#[derive(Clone, Debug, Default, Deserialize)]
pub struct NewUserForm {
    #[serde(default)]
    pub username: String,
    #[serde(default)]
    pub display_name: String,
    #[serde(default)]
    pub role: String,
    #[serde(default)]
    pub password: String,
}

#[derive(Clone, Debug, Default, Deserialize)]
pub struct NewTokenForm {
    #[serde(default)]
    pub name: String,
    #[serde(default)]
    pub role: String,
    /// `YYYY-MM-DD`: the token stops at the start of that day (UTC); empty: no expiry.
    #[serde(default)]
    pub expires: String,
}

#[derive(Template, WebTemplate)]
#[template(path = "admin/index.html")]
pub struct AdminPage {
    pub ctx: PageCtx,
    pub users: Vec<UserRow>,
    pub tokens: Vec<TokenRow>,
    pub roles: [&'static str; 3],
    pub notice: String,
    pub errors: FieldErrors,
    pub new_user: NewUserForm,
    pub new_token: NewTokenForm,
    pub shown_once: Option<ShownOnce>,
}

impl AdminPage {
    async fn load(state: &AppState, ctx: PageCtx, actor: &Actor) -> Result<AdminPage, AppError> {
        let users = users::list(&state.db).await?;
        let mut locks = Vec::with_capacity(users.len());
        for u in &users {
            locks.push(
                throttle::locked_addresses(&state.db, &u.username)
                    .await?
                    .join(", "),
            );
        }
        let tokens = tokens::list(&state.db).await?;
        Ok(AdminPage {
            ctx,
            users: users
                .into_iter()
                .zip(locks)
                .map(|(u, locked_from)| UserRow {
                    locked_from,
                    is_self: actor.user_id == Some(u.id),
                    id: u.id,
                    username: u.username,
                    display_name: u.display_name,
                    role: u.role,
                    created_at: u.created_at,
                    disabled_at: u.disabled_at.unwrap_or_default(),
                })
                .collect(),
            tokens: tokens
                .into_iter()
                .map(|t| TokenRow {
                    id: t.id,
                    name: t.name,
                    prefix: t.token_prefix,
                    role: t.role,
                    created_at: t.created_at,
                    last_used_at: t.last_used_at.unwrap_or_default(),
                    revoked_at: t.revoked_at.unwrap_or_default(),
                    owner: t.owner.unwrap_or_default(),
                    expires_at: t.expires_at.unwrap_or_default(),
                })
                .collect(),
            roles: ROLES,
            notice: String::new(),
            errors: FieldErrors::default(),
            new_user: NewUserForm {
                role: "technician".into(),
                ..NewUserForm::default()
            },
            new_token: NewTokenForm {
                role: "technician".into(),
                ..NewTokenForm::default()
            },
            shown_once: None,
        })
    }
}

#[derive(Deserialize)]
struct DoneQuery {
    #[serde(default)]
    done: String,
}

fn notice(done: &str) -> &'static str {
    match done {
        "user-added" => "User added.",
        "role" => "Role changed.",
        "disabled" => "User disabled; their sessions have ended.",
        "enabled" => "User enabled.",
        "revoked" => "Token revoked; it is refused from now on.",
        "unlocked" => "Account unlocked; its failed logins no longer count.",
        _ => "",
    }
}

async fn index(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Query(query): Query<DoneQuery>,
) -> Response {
    match AdminPage::load(&state, ctx, &actor).await {
        Ok(mut page) => {
            page.notice = notice(&query.done).to_string();
            page.into_response()
        }
        Err(error) => super::page_error(error),
    }
}

/// A refused write as a page: 422 naming the field, 404, or 500 (cause logged).
fn refused(error: WriteError) -> Response {
    let error = match error {
        WriteError::Invalid { field, message } | WriteError::Conflict { field, message } => {
            AppError::field(field, "invalid", message)
        }
        WriteError::NotFound(what) => AppError::not_found(what),
        WriteError::Db(cause) => AppError::from(cause),
    };
    super::page_error(error)
}

/// Puts a refusal beside its field on `page` (`field_as` renames the field); other failures
/// come back as a page of their own.
fn beside_field(
    error: WriteError,
    page: &mut AdminPage,
    rename: &[(&str, &str)],
) -> Option<Response> {
    match error {
        WriteError::Invalid { field, message } | WriteError::Conflict { field, message } => {
            let shown = rename
                .iter()
                .find(|(from, _)| *from == field)
                .map_or(field, |(_, to)| to);
            page.errors.push(shown, message);
            None
        }
        other => Some(refused(other)),
    }
}

fn role_field(text: &str) -> Result<Role, WriteError> {
    Role::parse(text.trim())
        .ok_or_else(|| WriteError::invalid("role", "choose technician, manager or admin"))
}

fn no_record() -> Response {
    super::page_error(AppError::not_found("this record"))
}

async fn add_user(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Form(form): Form<NewUserForm>,
) -> Response {
    let mut page = match AdminPage::load(&state, ctx, &actor).await {
        Ok(page) => page,
        Err(error) => return super::page_error(error),
    };
    let generated = form.password.is_empty();
    let secret = if generated {
        match password::generate() {
            Ok(p) => p,
            Err(error) => return super::page_error(AppError::internal(error)),
        }
    } else {
        form.password.clone()
    };
    let result = match role_field(&form.role) {
        Ok(role) => {
            users::create(
                &state.db,
                &actor,
                &form.username,
                &form.display_name,
                role,
                &secret,
            )
            .await
        }
        Err(error) => Err(error),
    };
    match result {
        Ok(user) if generated => {
            let mut page = match AdminPage::load(&state, page.ctx, &actor).await {
                Ok(page) => page,
                Err(error) => return super::page_error(error),
            };
            page.notice = format!("User {} added.", user.username);
            page.shown_once = Some(ShownOnce {
                what: format!("Password for {}", user.username),
                secret,
            });
            page.into_response()
        }
        Ok(_) => Redirect::to("/admin?done=user-added").into_response(),
        Err(error) => {
            if let Some(response) = beside_field(error, &mut page, &[]) {
                return response;
            }
            page.new_user = NewUserForm {
                password: String::new(),
                ..form
            };
            (StatusCode::UNPROCESSABLE_ENTITY, page).into_response()
        }
    }
}

#[derive(Deserialize)]
struct RoleForm {
    #[serde(default)]
    role: String,
}

async fn apply(state: &AppState, actor: &Actor, id: &str, change: Change, done: &str) -> Response {
    let Ok(id) = id.parse::<i64>() else {
        return no_record();
    };
    match users::change(&state.db, actor, id, change).await {
        Ok(_) => Redirect::to(&format!("/admin?done={done}")).into_response(),
        Err(error) => refused(error),
    }
}

async fn change_role(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
    Form(form): Form<RoleForm>,
) -> Response {
    match role_field(&form.role) {
        Ok(role) => apply(&state, &actor, &id, Change::Role(role), "role").await,
        Err(error) => refused(error),
    }
}

async fn disable(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    apply(&state, &actor, &id, Change::Disable, "disabled").await
}

/// Clears the locks failed logins put on a user.
async fn unlock(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    let Ok(id) = id.parse::<i64>() else {
        return no_record();
    };
    match users::unlock(&state.db, &actor, id).await {
        Ok(_) => Redirect::to("/admin?done=unlocked").into_response(),
        Err(error) => refused(error),
    }
}

async fn enable(State(state): State<AppState>, actor: Actor, Path(id): Path<String>) -> Response {
    apply(&state, &actor, &id, Change::Enable, "enabled").await
}

/// Sets a generated password, shows it once and ends the user's sessions.
async fn new_password(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Path(id): Path<String>,
) -> Response {
    let Ok(id) = id.parse::<i64>() else {
        return no_record();
    };
    let secret = match password::generate() {
        Ok(p) => p,
        Err(error) => return super::page_error(AppError::internal(error)),
    };
    let user = match users::set_password(&state.db, &actor, id, &secret).await {
        Ok(user) => user,
        Err(error) => return refused(error),
    };
    match AdminPage::load(&state, ctx, &actor).await {
        Ok(mut page) => {
            page.notice = format!(
                "New password set for {}; their sessions have ended.",
                user.username
            );
            page.shown_once = Some(ShownOnce {
                what: format!("Password for {}", user.username),
                secret,
            });
            page.into_response()
        }
        Err(error) => super::page_error(error),
    }
}

async fn create_token(
    State(state): State<AppState>,
    ctx: PageCtx,
    actor: Actor,
    Form(form): Form<NewTokenForm>,
) -> Response {
    let expires = match form.expires.trim() {
        "" => Ok(None),
        day => crate::auth::cli::expiry(day)
            .map(Some)
            .map_err(|m| WriteError::invalid("expires", m)),
    };
    // a token made here acts for the admin who made it
    let result = match (role_field(&form.role), expires, actor.user_id) {
        (Ok(role), Ok(expires), Some(owner)) => {
            let at = expires.as_deref();
            tokens::create_owned(&state.db, &actor, &form.name, role, owner, at).await
        }
        (Err(error), _, _) | (_, Err(error), _) => Err(error),
        (Ok(role), Ok(_), None) => tokens::create(&state.db, &actor, &form.name, role).await,
    };
    let mut page = match AdminPage::load(&state, ctx, &actor).await {
        Ok(page) => page,
        Err(error) => return super::page_error(error),
    };
    match result {
        Ok((stored, token)) => {
            page.notice = format!("Token {} created.", stored.name);
            page.shown_once = Some(ShownOnce {
                what: format!("Token {}", stored.name),
                secret: token,
            });
            page.into_response()
        }
        Err(error) => {
            let rename = [
                ("name", "token_name"),
                ("role", "token_role"),
                ("expires", "token_expires"),
            ];
            if let Some(response) = beside_field(error, &mut page, &rename) {
                return response;
            }
            page.new_token = form;
            (StatusCode::UNPROCESSABLE_ENTITY, page).into_response()
        }
    }
}

async fn revoke_token(
    State(state): State<AppState>,
    actor: Actor,
    Path(id): Path<String>,
) -> Response {
    let Ok(id) = id.parse::<i64>() else {
        return no_record();
    };
    match tokens::revoke(&state.db, &actor, id).await {
        Ok(_) => Redirect::to("/admin?done=revoked").into_response(),
        Err(error) => refused(error),
    }
}
