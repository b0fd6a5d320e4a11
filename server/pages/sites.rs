//! Site pages: the list of sites with an add form, and a site's edit form.

use super::ctx::PageCtx;
use super::forms::{self, Builder, FormPage, Posted, Values};
use super::page_error;
use crate::api::paging::path_id;
use crate::api::sites as site_input;
use crate::app::AppState;
use crate::auth::Actor;
use crate::calc::quantity::{Dimension, UnitSystem};
use crate::db::page::Window;
use crate::db::sites::{self as store, Site, SiteFields};
use crate::error::AppError;
use crate::pages::view::FieldErrors;
use askama::Template;
use askama_web::WebTemplate;
use axum::Router;
use axum::extract::{Path, State};
use axum::http::StatusCode;
use axum::response::{IntoResponse, Redirect, Response};
use axum::routing::get;

pub fn router() -> Router<AppState> {
    Router::new()
        .route("/sites", get(list).post(create))
        .route("/sites/{id}/edit", get(edit_form).post(edit))
}

#[derive(Template, WebTemplate)]
#[template(path = "sites/list.html")]
pub struct SitesPage {
    pub ctx: PageCtx,
    pub sites: Vec<Site>,
    pub inputs: Vec<forms::Input>,
    pub summary: Vec<String>,
}

fn inputs(values: &Values, errors: &FieldErrors) -> Vec<forms::Input> {
    let mut b = Builder::new(values, errors);
    b.text("name", "Site name", "e.g. North Yard").required = true;
    b.select(
        "units",
        "Units its people read",
        forms::options(&[
            ("metric", "Metric (mm, bar, kN)"),
            ("us", "US (in, psi, lbf)"),
        ]),
    );
    b.quantity(
        "trapped_oil_warming",
        "Trapped-oil warming to allow for",
        Dimension::TemperatureChange,
        UnitSystem::Metric,
    )
    .hint = "How much oil shut in a parked machine may warm here (sun, engine heat); blank: 10 degC, our default".into();
    b.finish()
}

async fn page(state: &AppState, ctx: PageCtx, values: &Values, errors: &FieldErrors) -> Response {
    let sites = match store::list(
        &state.db,
        false,
        Window {
            after_id: 0,
            limit: 200,
        },
    )
    .await
    {
        Ok(page) => page.items,
        Err(e) => return page_error(e.into()),
    };
    let inputs = inputs(values, errors);
    let status = if errors.is_empty() {
        StatusCode::OK
    } else {
        StatusCode::UNPROCESSABLE_ENTITY
    };
    let summary = forms::summary(&inputs, errors);
    (
        status,
        SitesPage {
            ctx,
            sites,
            inputs,
            summary,
        },
    )
        .into_response()
}

async fn list(State(state): State<AppState>, ctx: PageCtx) -> Response {
    let mut values = Values::new();
    values.insert("units".into(), "metric".into());
    page(&state, ctx, &values, &FieldErrors::default()).await
}

async fn save(
    state: &AppState,
    actor: &Actor,
    id: Option<i64>,
    fields: &SiteFields,
) -> Result<Site, AppError> {
    let (_write, mut tx) = crate::db::begin_write(&state.db).await?;
    let site = match id {
        None => store::insert(&mut tx, &actor.name, &crate::db::now_rfc3339(), fields).await?,
        Some(id) => store::update(&mut tx, &actor.name, id, fields, None).await?,
    };
    tx.commit().await?;
    Ok(site)
}

fn empty() -> SiteFields {
    SiteFields {
        name: String::new(),
        units: "metric".into(),
        trapped_oil_warming_k: None,
    }
}

async fn create(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    posted: Posted,
) -> Response {
    let map = posted.to_object(&[], None);
    let saved = match site_input::read(&map, empty()) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, None, &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(_) => Redirect::to("/sites").into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => page(&state, ctx, &posted.values(), &errors).await,
            Err(page) => *page,
        },
    }
}

async fn load(state: &AppState, id: &str) -> Result<Site, Response> {
    let id = path_id(id, "site").map_err(page_error)?;
    match store::find(&state.db, id).await {
        Ok(Some(site)) => Ok(site),
        Ok(None) => Err(page_error(AppError::not_found(format!("site {id}")))),
        Err(e) => Err(page_error(e.into())),
    }
}

fn values(site: &SiteFields) -> Values {
    let mut v = Values::new();
    v.insert("name".into(), site.name.clone());
    v.insert("units".into(), site.units.clone());
    let units = if site.units == "us" {
        UnitSystem::Us
    } else {
        UnitSystem::Metric
    };
    v.insert(
        "trapped_oil_warming".into(),
        forms::quantity_text(
            site.trapped_oil_warming_k,
            Dimension::TemperatureChange,
            units,
        ),
    );
    v
}

fn edit_page(ctx: PageCtx, site: &Site, values: &Values, errors: &FieldErrors) -> Response {
    FormPage {
        ctx,
        title: format!("Edit {}", site.name),
        intro: String::new(),
        action: format!("/sites/{}/edit", site.id),
        submit: "Save changes",
        cancel_href: "/sites".into(),
        inputs: inputs(values, errors),
        summary: Vec::new(),
    }
    .respond(errors)
}

async fn edit_form(
    State(state): State<AppState>,
    ctx: PageCtx,
    Path(id): Path<String>,
) -> Response {
    match load(&state, &id).await {
        Ok(site) => edit_page(ctx, &site, &values(&site.fields()), &FieldErrors::default()),
        Err(page) => page,
    }
}

async fn edit(
    State(state): State<AppState>,
    actor: Actor,
    ctx: PageCtx,
    Path(id): Path<String>,
    posted: Posted,
) -> Response {
    let site = match load(&state, &id).await {
        Ok(site) => site,
        Err(page) => return page,
    };
    let map = posted.to_object(&[], Some(&values(&site.fields())));
    let saved = match site_input::read(&map, site.fields()) {
        Err(problems) => Err(problems),
        Ok((fields, _)) => save(&state, &actor, Some(site.id), &fields)
            .await
            .map_err(|e| vec![e]),
    };
    match saved {
        Ok(_) => Redirect::to("/sites").into_response(),
        Err(problems) => match forms::refused(problems) {
            Ok(errors) => edit_page(ctx, &site, &posted.values(), &errors),
            Err(page) => *page,
        },
    }
}
