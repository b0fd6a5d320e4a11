//! The `loadhold` command: serve, demo, seed-demo, migrate, backup.

use clap::{Parser, Subcommand};
use loadhold::{app, db};
use std::net::SocketAddr;
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use tokio::net::TcpListener;

/// mimalloc instead of glibc malloc: under many connections glibc's arena locks and
/// free-list work took about 45 % of the server's CPU (profile in tests/bench/ANALYSIS.md).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

#[derive(Parser)]
#[command(
    name = "loadhold",
    version,
    about = "Registry and engineering core for a fleet's hydraulic cylinders and hoses"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Serve the API and pages.
    Serve {
        #[arg(long, env = "LOADHOLD_DB", default_value = "loadhold.sqlite")]
        db: PathBuf,
        #[arg(long, env = "LOADHOLD_ADDR", default_value = "127.0.0.1:8080")]
        addr: SocketAddr,
        /// Mark session cookies Secure (set this when clients reach the server over TLS).
        #[arg(long, env = "LOADHOLD_SECURE_COOKIES")]
        secure_cookies: bool,
        /// The address tablets reach the server at, e.g. `https://loadhold.example.org`
        /// (labels' QR codes point there).
        #[arg(long, env = "LOADHOLD_PUBLIC_URL")]
        public_url: Option<String>,
    },
    /// Load the demo fleet into a fresh database and serve it.
    Demo {
        #[arg(long, env = "LOADHOLD_DB", default_value = "loadhold-demo.sqlite")]
        db: PathBuf,
        #[arg(long, env = "LOADHOLD_ADDR", default_value = "127.0.0.1:8080")]
        addr: SocketAddr,
        /// The address tablets reach the server at (labels' QR codes point there).
        #[arg(long, env = "LOADHOLD_PUBLIC_URL")]
        public_url: Option<String>,
    },
    /// Load the demo fleet (or a generated fleet of N machines) into a database.
    SeedDemo {
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
        /// Generate N machines with about 4 cylinders and 6 hoses each and five years of history.
        #[arg(long)]
        scale: Option<u32>,
    },
    /// Apply pending migrations and exit.
    Migrate {
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
    },
    /// Manage user accounts.
    User {
        #[command(subcommand)]
        command: UserCommand,
    },
    /// Manage API bearer tokens.
    Token {
        #[command(subcommand)]
        command: TokenCommand,
    },
    /// Import sites and machines from CSV files (kind from the headers or --kind).
    Import {
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Check and report only; store nothing.
        #[arg(long)]
        dry_run: bool,
        /// sites or machines (default: from the headers).
        #[arg(long)]
        kind: Option<String>,
        /// Store the good rows and report the bad ones (default: a file with a bad row stores nothing).
        #[arg(long)]
        skip_bad_rows: bool,
    },
    /// Write a consistent copy of a live database to OUT.
    Backup {
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
        out: PathBuf,
    },
}

#[derive(Subcommand)]
enum UserCommand {
    /// Add a user. The password is read from standard input, or generated and printed once.
    Add {
        name: String,
        #[arg(long)]
        role: String,
        /// The name shown on signed records (default: the user name).
        #[arg(long)]
        display_name: Option<String>,
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
    },
    /// Clear the lock that failed logins put on an account.
    Unlock {
        name: String,
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
    },
    /// Disable a user: no more logins; their sessions end and the tokens they own stop.
    Disable {
        name: String,
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
    },
}

#[derive(Subcommand)]
enum TokenCommand {
    /// Create an API token and print it once.
    Create {
        name: String,
        #[arg(long, env = "LOADHOLD_DB")]
        db: PathBuf,
        /// technician (default), manager or admin; not above the owner's role.
        #[arg(long)]
        role: Option<String>,
        /// The user the token acts for; it stops when they are disabled or demoted below
        /// it (default: the service account `cli-tokens`).
        #[arg(long)]
        owner: Option<String>,
        /// The token stops working at the start of this day (UTC), YYYY-MM-DD.
        #[arg(long)]
        expires: Option<String>,
    },
}

fn main() -> ExitCode {
    init_tracing();
    let runtime = match tokio::runtime::Runtime::new() {
        Ok(runtime) => runtime,
        Err(error) => {
            eprintln!("loadhold: cannot start the runtime: {error}");
            return ExitCode::FAILURE;
        }
    };
    match runtime.block_on(run(Cli::parse().command)) {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("loadhold: {message}");
            ExitCode::FAILURE
        }
    }
}

fn init_tracing() {
    use tracing_subscriber::EnvFilter;
    let filter = EnvFilter::try_from_env("LOADHOLD_LOG")
        .unwrap_or_else(|_| EnvFilter::new("info,sqlx=warn,tower_http=warn"));
    let builder = tracing_subscriber::fmt()
        .with_env_filter(filter)
        .with_writer(std::io::stderr);
    if std::env::var("LOADHOLD_LOG_FORMAT").as_deref() == Ok("json") {
        builder.json().init();
    } else {
        // colour codes only on a terminal; user text has its control characters escaped
        use std::io::IsTerminal;
        builder
            .with_ansi(std::io::stderr().is_terminal())
            .fmt_fields(loadhold::log_format::fields())
            .init();
    }
}

/// Opens a database that must already exist (`user`, `token`, `backup`): a mistyped path is
/// an error, never a new empty database. `migrate`, `serve` and the seeders create one.
fn existing(path: &Path) -> Result<(), String> {
    if path.is_file() {
        Ok(())
    } else {
        Err(format!(
            "there is no database at {}; check --db (create one with `loadhold migrate --db {}`)",
            path.display(),
            path.display()
        ))
    }
}

async fn open_existing(path: &Path) -> Result<db::Db, String> {
    existing(path)?;
    open(path).await
}

async fn open(path: &Path) -> Result<db::Db, String> {
    db::open(path)
        .await
        .map_err(|e| format!("cannot open database {}: {e}", path.display()))
}

async fn run(command: Command) -> Result<(), String> {
    match command {
        Command::Serve {
            db,
            addr,
            secure_cookies,
            public_url,
        } => {
            loadhold::auth::cookie::set_secure(secure_cookies);
            let pool = open(&db).await?;
            serve(pool, addr, None, public_url).await
        }
        Command::Demo {
            db,
            addr,
            public_url,
        } => {
            remove_database(&db)?;
            let pool = open(&db).await?;
            let report = loadhold::seed::load_demo(&pool)
                .await
                .map_err(|e| format!("cannot load the demo fleet: {e}"))?;
            let logins = loadhold::auth::demo::create_demo_users(&pool).await?;
            serve(pool, addr, Some(format!("{report}\n{logins}")), public_url).await
        }
        Command::Import {
            db,
            files,
            dry_run,
            kind,
            skip_bad_rows,
        } => {
            let pool = open_existing(&db).await?;
            let options = loadhold::import::registry::Options {
                dry_run,
                skip_bad_rows,
            };
            loadhold::import::run_cli(&pool, &files, kind.as_deref(), options).await
        }
        Command::SeedDemo { db, scale } => {
            let pool = open(&db).await?;
            let report = match scale {
                Some(n) => loadhold::seed::generate(&pool, n).await,
                None => loadhold::seed::load_demo(&pool).await,
            }
            .map_err(|e| format!("cannot seed {}: {e}", db.display()))?;
            println!("{report}");
            Ok(())
        }
        Command::Migrate { db } => {
            let pool = open(&db).await?;
            pool.close().await;
            println!("{}: migrations applied", db.display());
            Ok(())
        }
        Command::User {
            command:
                UserCommand::Add {
                    name,
                    role,
                    display_name,
                    db,
                },
        } => {
            let pool = open_existing(&db).await?;
            let result =
                loadhold::auth::cli::user_add(&pool, &name, &role, display_name.as_deref()).await;
            pool.close().await;
            println!("{}", result?);
            Ok(())
        }
        Command::User {
            command: UserCommand::Unlock { name, db },
        } => {
            let pool = open_existing(&db).await?;
            let result = loadhold::auth::cli::user_unlock(&pool, &name).await;
            pool.close().await;
            println!("{}", result?);
            Ok(())
        }
        Command::User {
            command: UserCommand::Disable { name, db },
        } => {
            let pool = open_existing(&db).await?;
            let result = loadhold::auth::cli::user_disable(&pool, &name).await;
            pool.close().await;
            println!("{}", result?);
            Ok(())
        }
        Command::Token {
            command:
                TokenCommand::Create {
                    name,
                    db,
                    role,
                    owner,
                    expires,
                },
        } => {
            let pool = open_existing(&db).await?;
            let result = loadhold::auth::cli::token_create(
                &pool,
                &name,
                role.as_deref(),
                owner.as_deref(),
                expires.as_deref(),
            )
            .await;
            pool.close().await;
            println!("{}", result?);
            Ok(())
        }
        Command::Backup { db, out } => {
            existing(&db)?;
            let pool = db::connect(&db)
                .await
                .map_err(|e| format!("cannot open {}: {e}", db.display()))?;
            db::backup(&pool, &out)
                .await
                .map_err(|e| format!("backup failed: {e}"))?;
            println!("backup written to {}", out.display());
            Ok(())
        }
    }
}

/// Removes a demo database and its WAL files so the demo starts fresh.
fn remove_database(path: &Path) -> Result<(), String> {
    for suffix in ["", "-wal", "-shm"] {
        let file = PathBuf::from(format!("{}{suffix}", path.display()));
        if file.exists() {
            std::fs::remove_file(&file)
                .map_err(|e| format!("cannot remove {}: {e}", file.display()))?;
        }
    }
    Ok(())
}

async fn serve(
    pool: db::Db,
    addr: SocketAddr,
    banner: Option<String>,
    public_url: Option<String>,
) -> Result<(), String> {
    let listener = TcpListener::bind(addr)
        .await
        .map_err(|e| format!("cannot listen on {addr}: {e}"))?;
    let local = listener.local_addr().map_err(|e| e.to_string())?;
    if let Some(banner) = banner {
        println!("{banner}");
    }
    println!("Loadhold is serving at http://{local}/");
    tracing::info!(%local, "listening");
    let state = app::AppState::new(pool.clone()).with_public_url(public_url.as_deref());
    let router = app::app(state);
    loadhold::serve::run(listener, router, shutdown_signal()).await;
    pool.close().await;
    tracing::info!("stopped");
    Ok(())
}

/// Resolves on Ctrl-C or SIGTERM; in-flight requests then finish before the server exits.
async fn shutdown_signal() {
    let ctrl_c = async {
        let _ = tokio::signal::ctrl_c().await;
    };
    #[cfg(unix)]
    let terminate = async {
        match tokio::signal::unix::signal(tokio::signal::unix::SignalKind::terminate()) {
            Ok(mut signal) => {
                signal.recv().await;
            }
            Err(_) => std::future::pending::<()>().await,
        }
    };
    #[cfg(not(unix))]
    let terminate = std::future::pending::<()>();
    tokio::select! {
        () = ctrl_c => {},
        () = terminate => {},
    }
    tracing::info!("shutdown signal received; finishing requests in flight");
}
