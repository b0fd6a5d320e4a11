//! End-to-end suite: the real `loadhold` binary on 127.0.0.1 with its own SQLite file,
//! driven through real sockets and a real headless Chromium. Screenshots of every browser
//! step and the server logs are kept under `target/e2e-artifacts/<test>/`.

mod backup;
mod browser;
mod crash;
mod fit_screens; // issue 14
mod fixture;
mod form_errors;
mod hardening;
mod http;
mod manager;
mod openapi;
mod safety_loop;
mod server;
mod session_end; // issue 14
mod smoke;
mod technician;
mod writers;
