//! Who may do what, in one table: method + path pattern -> access. The first matching row
//! wins. Handlers need no checks of their own; the auth middleware applies this table.
//!
//! A pattern is matched segment by segment as a prefix of the path: `/calc` matches `/calc`
//! and `/calc/anything` but not `/calculator`; `*` stands for any one segment.

use super::Role;
use axum::http::Method;

/// What a request needs.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Access {
    /// Anyone, logged in or not.
    Public,
    /// A login or token whose role is at least this; the text completes "your role may not ...".
    AtLeast(Role, &'static str),
}

/// Which methods a row applies to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Methods {
    Any,
    /// GET, HEAD, OPTIONS.
    Read,
    /// Everything else: POST, PUT, PATCH, DELETE.
    Write,
}

struct Rule {
    methods: Methods,
    pattern: &'static str,
    access: Access,
}

const READ: &str = "read the registry";
const EDIT: &str = "edit the registry";
const SHOP: &str = "enter shop records";
const REPORTS: &str = "pull reports";
const ADMIN: &str = "manage users, tokens, settings or the audit log";
const RETURN: &str = "return a machine to service (a manager approves after a passing retest)";
const DUE: &str = "read the due list of your site";

const fn public(methods: Methods, pattern: &'static str) -> Rule {
    Rule {
        methods,
        pattern,
        access: Access::Public,
    }
}

const fn role(methods: Methods, pattern: &'static str, role: Role, what: &'static str) -> Rule {
    Rule {
        methods,
        pattern,
        access: Access::AtLeast(role, what),
    }
}

use Methods::{Any, Read, Write};
use Role::{Admin, Manager, Technician};

/// The table. Public rows first, then the most specific rows, then the defaults.
static RULES: &[Rule] = &[
    // Open to anyone: the calculator, health, assets, the login page, the API description.
    public(Any, "/healthz"),
    public(Any, "/static"),
    public(Any, "/login"),
    public(Any, "/calc"),
    public(Any, "/api/v1/calc"),
    public(Read, "/api/v1/openapi.json"),
    // Admins: accounts, tokens, settings, the audit log.
    role(Any, "/admin", Admin, ADMIN),
    role(Any, "/settings", Admin, ADMIN),
    role(Any, "/api/v1/admin", Admin, ADMIN),
    role(Any, "/api/v1/users", Admin, ADMIN),
    role(Any, "/api/v1/tokens", Admin, ADMIN),
    role(Any, "/api/v1/audit", Admin, ADMIN),
    role(Any, "/api/v1/settings", Admin, ADMIN),
    // Managers: returning a machine to service (the two-person rule, db::service_return).
    role(Any, "/api/v1/machines/*/return-to-service", Manager, RETURN),
    role(Any, "/machines/*/return-to-service", Manager, RETURN),
    // Technicians: reading the due list (the shop's work list); other reports are managers'.
    role(Read, "/api/v1/reports/due", Technician, DUE),
    // Technicians: the hose table (a default to confirm against the layline).
    role(Read, "/api/v1/hose-ratings", Technician, READ),
    // Managers: reports.
    role(Any, "/reports", Manager, REPORTS),
    role(Any, "/api/v1/reports", Manager, REPORTS),
    // Technicians: the shop pages and shop records (drift tests, decay tests, inspections).
    role(Any, "/shop", Technician, SHOP),
    role(Any, "/cylinders/*/drift-tests", Technician, SHOP),
    role(Any, "/cylinders/*/decay-tests", Technician, SHOP),
    role(Any, "/cylinders/*/pressure-decay-tests", Technician, SHOP),
    role(Any, "/machines/*/inspections", Technician, SHOP),
    role(Any, "/drift-tests", Technician, SHOP),
    role(Any, "/decay-tests", Technician, SHOP),
    role(Any, "/pressure-decay-tests", Technician, SHOP),
    role(Any, "/inspections", Technician, SHOP),
    role(Any, "/api/v1/cylinders/*/drift-tests", Technician, SHOP),
    role(Any, "/api/v1/cylinders/*/decay-tests", Technician, SHOP),
    role(
        Any,
        "/api/v1/cylinders/*/pressure-decay-tests",
        Technician,
        SHOP,
    ),
    role(Any, "/api/v1/machines/*/inspections", Technician, SHOP),
    role(Any, "/api/v1/drift-tests", Technician, SHOP),
    role(Any, "/api/v1/decay-tests", Technician, SHOP),
    role(Any, "/api/v1/pressure-decay-tests", Technician, SHOP),
    role(Any, "/api/v1/inspections", Technician, SHOP),
    role(Write, "/logout", Technician, READ),
    role(Any, "/account", Technician, "change your password"),
    // Managers: the registry's add and edit forms (their POSTs fall under the default below).
    role(Read, "/*/new", Manager, EDIT),
    role(Read, "/*/*/new", Manager, EDIT),
    role(Read, "/*/*/edit", Manager, EDIT),
    role(Read, "/*/*/*/new", Manager, EDIT),
    role(Read, "/*/*/*/edit", Manager, EDIT),
    // Defaults: any change is a registry edit; any read is a registry read.
    role(Write, "", Manager, EDIT),
    role(Read, "", Technician, READ),
];

fn is_read(method: &Method) -> bool {
    *method == Method::GET || *method == Method::HEAD || *method == Method::OPTIONS
}

fn matches(pattern: &str, path: &str) -> bool {
    let mut segments = path.split('/').filter(|s| !s.is_empty());
    pattern
        .split('/')
        .filter(|p| !p.is_empty())
        .all(|p| segments.next().is_some_and(|s| p == "*" || p == s))
}

/// The access a request needs. A path with `.` or `..` segments is never public.
pub fn access(method: &Method, path: &str) -> Access {
    let read = is_read(method);
    let dotted = path.split('/').any(|s| s == "." || s == "..");
    RULES
        .iter()
        .filter(|r| match r.methods {
            Any => true,
            Read => read,
            Write => !read,
        })
        .filter(|r| !(dotted && r.access == Access::Public))
        .find(|r| matches(r.pattern, path))
        .map(|r| r.access)
        .unwrap_or(Access::AtLeast(Admin, ADMIN))
}

/// True when a request needs no login.
pub fn is_public(method: &Method, path: &str) -> bool {
    access(method, path) == Access::Public
}
