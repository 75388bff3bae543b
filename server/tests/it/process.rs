//! The real `wrackline` binary as a child process on 127.0.0.1, for tests that kill it,
//! restart it, fill its disk or run its other commands. Its log goes to a file in the
//! system's temporary folder (printed when a test fails with it, removed with the server).

use std::io::{BufRead as _, BufReader};
use std::path::{Path, PathBuf};
use std::process::{Child, Command, Output, Stdio};
use std::sync::mpsc;
use std::time::Duration;

/// How long a server may take to start (a cold debug build on a busy machine).
const START_WITHIN: Duration = Duration::from_secs(90);

/// A running server.
pub struct Server {
    child: Child,
    /// `http://127.0.0.1:PORT`.
    pub base: String,
    pub log: PathBuf,
}

/// The `wrackline` binary this test build made.
pub fn binary() -> &'static str {
    env!("CARGO_BIN_EXE_wrackline")
}

/// Starts `wrackline serve` on `data_dir`, listening on `bind` (port 0 for any), with
/// `flags` added, and waits until it says where it listens.
pub fn start(data_dir: &Path, bind: &str, flags: &[&str]) -> Server {
    let mut command = Command::new(binary());
    command.arg("--data-dir").arg(data_dir).args(["serve", "--bind", bind]).args(flags);
    start_command(command).0
}

/// Starts `command` (a `wrackline` that serves), waits until it says where it listens,
/// and returns it with the lines it printed before that.
pub fn start_command(mut command: Command) -> (Server, Vec<String>) {
    // Not beside the data folder: that may be a disk a test fills.
    let log = std::env::temp_dir().join(format!("wrackline-test-{}.log", uuid::Uuid::new_v4().simple()));
    let mut child = command
        .env("RUST_LOG", "wrackline_server=info")
        .stdout(Stdio::piped())
        .stderr(std::fs::File::create(&log).expect("a log file"))
        .spawn()
        .expect("the wrackline binary starts");
    let stdout = child.stdout.take().expect("its standard output");
    let (found, listening) = mpsc::channel();
    std::thread::spawn(move || {
        let mut before = Vec::new();
        for line in BufReader::new(stdout).lines().map_while(Result::ok) {
            match line.strip_prefix("wrackline listening on ") {
                Some(base) => {
                    let _ = found.send((base.to_owned(), std::mem::take(&mut before)));
                }
                None => before.push(line),
            }
        }
    });
    let (base, printed) = match listening.recv_timeout(START_WITHIN) {
        Ok(found) => found,
        Err(_) => {
            let _ = child.kill();
            panic!("the server did not start within {START_WITHIN:?}; its log:\n{}", read_log(&log));
        }
    };
    (Server { child, base, log }, printed)
}

impl Server {
    /// Kills the process at once (SIGKILL): no graceful anything, as a power cut or the
    /// kernel's OOM killer would.
    pub fn kill(mut self) {
        self.child.kill().expect("SIGKILL");
        self.child.wait().expect("the killed server is reaped");
    }

    /// Asks the server to stop (SIGTERM) and waits for it.
    pub fn stop(mut self) {
        let status = Command::new("kill").args(["-TERM", &self.child.id().to_string()]).status();
        assert!(status.is_ok_and(|s| s.success()), "SIGTERM could not be sent");
        let waited = wait_for_exit(&mut self.child, Duration::from_secs(20));
        if !waited {
            let _ = self.child.kill();
            panic!("the server did not stop within 20 s of SIGTERM");
        }
    }

    /// The server's log so far.
    pub fn log(&self) -> String {
        read_log(&self.log)
    }
}

impl Drop for Server {
    fn drop(&mut self) {
        // A test that failed half-way leaves no server behind.
        let _ = self.child.kill();
        let _ = self.child.wait();
        if !std::thread::panicking() {
            let _ = std::fs::remove_file(&self.log);
        }
    }
}

fn wait_for_exit(child: &mut Child, within: Duration) -> bool {
    let deadline = std::time::Instant::now() + within;
    while std::time::Instant::now() < deadline {
        if child.try_wait().ok().flatten().is_some() {
            return true;
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    false
}

fn read_log(path: &Path) -> String {
    std::fs::read_to_string(path).unwrap_or_default()
}

/// Runs another `wrackline` command on `data_dir` to the end.
pub fn run(data_dir: &Path, args: &[&str]) -> Output {
    Command::new(binary()).arg("--data-dir").arg(data_dir).args(args).output().expect("the wrackline binary runs")
}

/// Standard output and error of a finished command, for messages.
pub fn said(output: &Output) -> String {
    format!("{}{}", String::from_utf8_lossy(&output.stdout), String::from_utf8_lossy(&output.stderr))
}
