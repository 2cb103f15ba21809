//! `flatray-correct`: correct a CSV file of through-water survey points.
//!
//! Reads a point file (a header row, then one point per row: `x`, `y`, `z` plus
//! either the sensor position `sensor_x`, `sensor_y`, `sensor_z` or a `cameras`
//! column listing the ids of the cameras that saw the point, with the camera
//! centres in a second file `id,x,y,z`), applies the chosen correction, and
//! writes every input row again with the columns `true_x`, `true_y`, `true_z`
//! (`rms_miss_m` for the multi-view methods), `status` and `detail` appended.
//! No row is dropped: a row that cannot be read gets the status `bad_row` and
//! its line number is reported on stderr. A summary is printed at the end.
//!
//! Coordinates: metres, z up, a horizontal water surface at `--surface-z`.
//!
//! Exit status: 0 when every row was corrected, 2 when some rows failed or were
//! malformed (all of them are still in the output, with their status), 1 when
//! the files could not be read or written.

use std::collections::HashMap;
use std::fs::File;
use std::io::{self, BufReader, BufWriter, Write};
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use std::time::Instant;

use clap::{Parser, ValueEnum};
use flatray::media::Medium;
use flatray::survey::{correct_multiviews, correct_ranges, GroupIndices, Multiview, Views};
use flatray::{batch, Image, Stack, Status, Vec3};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

/// Rows corrected per library batch call (each call runs on every core).
const CHUNK: usize = 65_536;
/// Malformed rows reported one by one on stderr before the rest are only counted.
const REPORTED_BAD_ROWS: usize = 20;

#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
enum Method {
    /// Laser ranges: the sensor columns give the laser's position; the beam is
    /// refracted and its travel time rescaled by each medium's group index.
    Range,
    /// Points triangulated from several photographs as if light travelled
    /// straight; the `cameras` column names the cameras that saw each point. The
    /// exact correction.
    Views,
    /// As `views`, with the common shortcut (refract each camera's straight line
    /// to the point and intersect): an approximation, for comparison.
    ViewsShortcut,
    /// One photograph per point: the sensor columns give the camera; the point
    /// is moved along the vertical to its true depth (sagittal image).
    SingleView,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
enum Progress {
    /// A progress bar when stderr is a terminal.
    Auto,
    /// A progress bar on a terminal, else a plain line every 10 %.
    Always,
    /// No progress output.
    Never,
}

/// Correct through-water survey points (refraction at a flat water surface).
#[derive(Debug, Parser)]
#[command(
    name = "flatray-correct",
    version,
    about = "Correct through-water survey points for refraction at a flat water surface",
    after_help = "Point file: a header row, then x, y, z (metres, z up) and either sensor_x, sensor_y, sensor_z (range, single-view) or cameras (views methods: camera ids separated by spaces or ';'). Other columns are copied. Output: every input row plus true_x, true_y, true_z, [rms_miss_m], status, detail. Exit status: 0 all rows corrected, 2 some rows failed or malformed (still written), 1 fatal."
)]
struct Args {
    /// The point file (CSV with a header row).
    #[arg(long, value_name = "FILE")]
    points: PathBuf,
    /// Where to write the corrected file (CSV).
    #[arg(long, value_name = "FILE")]
    output: PathBuf,
    /// Which correction to apply.
    #[arg(long, value_enum)]
    method: Method,
    /// Camera centres (CSV with the columns id, x, y, z); needed by the views methods.
    #[arg(long, value_name = "FILE")]
    cameras: Option<PathBuf>,
    /// Height of the water surface, metres (z up).
    #[arg(long, default_value_t = 0.0, value_name = "METRES")]
    surface_z: f64,
    /// Vacuum wavelength of the light, nm (sets the indices from the media models).
    #[arg(long, default_value_t = 532.0, value_name = "NM")]
    wavelength_nm: f64,
    /// Water temperature, degrees Celsius.
    #[arg(long, default_value_t = 20.0, value_name = "CELSIUS")]
    water_temperature_c: f64,
    /// Water salinity, PSU (0: fresh water).
    #[arg(long, default_value_t = 0.0, value_name = "PSU")]
    salinity_psu: f64,
    /// Air temperature, degrees Celsius.
    #[arg(long, default_value_t = 20.0, value_name = "CELSIUS")]
    air_temperature_c: f64,
    /// Use this refractive index of air instead of the model's.
    #[arg(long, value_name = "INDEX")]
    air_index: Option<f64>,
    /// Use this refractive index of water instead of the model's.
    #[arg(long, value_name = "INDEX")]
    water_index: Option<f64>,
    /// Use this group index of air (range method) instead of the model's.
    #[arg(long, value_name = "INDEX")]
    air_group_index: Option<f64>,
    /// Use this group index of water (range method) instead of the model's.
    #[arg(long, value_name = "INDEX")]
    water_group_index: Option<f64>,
    /// The image convention of the single-view method.
    #[arg(long, value_enum, default_value_t = ImageArg::Sagittal)]
    image: ImageArg,
    /// Progress output on stderr.
    #[arg(long, value_enum, default_value_t = Progress::Auto)]
    progress: Progress,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
enum ImageArg {
    /// On the vertical through the point (the usual survey apparent depth).
    Sagittal,
    /// On the caustic of the rays in the plane of incidence.
    Tangential,
}

/// A fatal error: a message for stderr.
struct Fatal(String);

impl<E: std::fmt::Display> From<E> for Fatal {
    fn from(e: E) -> Fatal {
        Fatal(e.to_string())
    }
}

fn main() -> ExitCode {
    let args = Args::parse();
    match run(&args) {
        Ok(summary) => {
            if summary.failed() > 0 {
                ExitCode::from(2)
            } else {
                ExitCode::SUCCESS
            }
        }
        Err(Fatal(message)) => {
            eprintln!("flatray-correct: {message}");
            ExitCode::from(1)
        }
    }
}

/// The media and their indices.
struct Setup {
    stack: Stack,
    groups: GroupIndices,
}

fn setup(args: &Args) -> Result<Setup, Fatal> {
    let air = Medium::air(args.air_temperature_c, 101_325.0, 0.5);
    let water = if args.salinity_psu > 0.0 {
        Medium::seawater(args.water_temperature_c, args.salinity_psu)
    } else {
        Medium::pure_water(args.water_temperature_c, 101_325.0)
    };
    let index = |given: Option<f64>, medium: Medium, what: &str| -> Result<f64, Fatal> {
        match given {
            Some(n) => Ok(n),
            None => medium.index(args.wavelength_nm).map_err(|e| {
                Fatal(format!(
                    "{what} index at {} nm: {e} (give it with --{what}-index)",
                    args.wavelength_nm
                ))
            }),
        }
    };
    let group = |given: Option<f64>, medium: Medium, what: &str| -> Result<f64, Fatal> {
        match given {
            Some(n) => Ok(n),
            None => medium.group_index(args.wavelength_nm).map_err(|e| {
                Fatal(format!(
                    "{what} group index at {} nm: {e} (give it with --{what}-group-index)",
                    args.wavelength_nm
                ))
            }),
        }
    };
    let n_air = index(args.air_index, air, "air")?;
    let n_water = index(args.water_index, water, "water")?;
    let stack = Stack::single_interface(
        Vec3::new(0.0, 0.0, args.surface_z),
        Vec3::new(0.0, 0.0, -1.0),
        n_air,
        n_water,
    )
    .map_err(|e| Fatal(format!("the water surface and indices: {e}")))?;
    let groups = if args.method == Method::Range {
        let g_air = group(args.air_group_index, air, "air")?;
        let g_water = group(args.water_group_index, water, "water")?;
        GroupIndices::new(&[g_air, g_water]).map_err(|e| Fatal(format!("group indices: {e}")))?
    } else {
        GroupIndices::phase_of(&stack)
    };
    Ok(Setup { stack, groups })
}

/// Camera centres by id, from `id,x,y,z`.
struct Cameras {
    ids: HashMap<String, u32>,
    centres: Vec<Vec3>,
}

fn read_cameras(path: &Path) -> Result<Cameras, Fatal> {
    let mut reader = csv::ReaderBuilder::new()
        .flexible(true)
        .trim(csv::Trim::All)
        .from_path(path)
        .map_err(|e| {
            Fatal(format!(
                "cannot read the cameras file {}: {e}",
                path.display()
            ))
        })?;
    let header = reader.headers()?.clone();
    let col = |name: &str| -> Result<usize, Fatal> {
        column(&header, name).ok_or_else(|| {
            Fatal(format!(
                "the cameras file {} has no column `{name}` (it needs id, x, y, z)",
                path.display()
            ))
        })
    };
    let (ci, cx, cy, cz) = (col("id")?, col("x")?, col("y")?, col("z")?);
    let mut cameras = Cameras {
        ids: HashMap::new(),
        centres: Vec::new(),
    };
    for record in reader.records() {
        let record = record?;
        let line = record.position().map_or(0, |p| p.line());
        let id = record.get(ci).unwrap_or("").to_string();
        if id.is_empty() {
            return Err(Fatal(format!(
                "{}: line {line}: camera without an id",
                path.display()
            )));
        }
        let centre = (|| -> Result<Vec3, String> {
            Ok(Vec3::new(
                number(&record, cx, "x")?,
                number(&record, cy, "y")?,
                number(&record, cz, "z")?,
            ))
        })()
        .map_err(|e| Fatal(format!("{}: line {line}: {e}", path.display())))?;
        let index = u32::try_from(cameras.centres.len())
            .map_err(|_| Fatal("too many cameras".to_string()))?;
        if cameras.ids.insert(id.clone(), index).is_some() {
            return Err(Fatal(format!(
                "{}: line {line}: camera id `{id}` appears twice",
                path.display()
            )));
        }
        cameras.centres.push(centre);
    }
    Ok(cameras)
}

/// The index of a header column, by name, ignoring case.
fn column(header: &csv::StringRecord, name: &str) -> Option<usize> {
    header.iter().position(|h| h.eq_ignore_ascii_case(name))
}

/// A number from column `i` (named `name`), or a message.
fn number(record: &csv::StringRecord, i: usize, name: &str) -> Result<f64, String> {
    match record.get(i) {
        None => Err(format!("column `{name}` is missing")),
        Some("") => Err(format!("column `{name}` is empty")),
        Some(text) => text
            .parse::<f64>()
            .map_err(|_| format!("column `{name}` is not a number: `{text}`")),
    }
}

/// Where the input columns are.
struct Layout {
    x: usize,
    y: usize,
    z: usize,
    sensor: Option<[usize; 3]>,
    cameras: Option<usize>,
}

fn layout(header: &csv::StringRecord, method: Method, path: &Path) -> Result<Layout, Fatal> {
    let need = |name: &str, why: &str| -> Result<usize, Fatal> {
        column(header, name).ok_or_else(|| {
            Fatal(format!(
                "the point file {} has no column `{name}` ({why}); its columns are: {}",
                path.display(),
                header.iter().collect::<Vec<_>>().join(", ")
            ))
        })
    };
    let point = "every method needs x, y, z";
    let (x, y, z) = (need("x", point)?, need("y", point)?, need("z", point)?);
    let (sensor, cameras) = match method {
        Method::Range | Method::SingleView => {
            let why = "this method needs the sensor position sensor_x, sensor_y, sensor_z";
            (
                Some([
                    need("sensor_x", why)?,
                    need("sensor_y", why)?,
                    need("sensor_z", why)?,
                ]),
                None,
            )
        }
        Method::Views | Method::ViewsShortcut => (
            None,
            Some(need(
                "cameras",
                "the views methods need the ids of the cameras that saw each point",
            )?),
        ),
    };
    Ok(Layout {
        x,
        y,
        z,
        sensor,
        cameras,
    })
}

/// One chunk of rows and what was parsed from them.
#[derive(Default)]
struct Chunk {
    records: Vec<csv::StringRecord>,
    /// `Some(message)` for a malformed row.
    bad: Vec<Option<String>>,
    points: Vec<Vec3>,
    sensors: Vec<Vec3>,
    offsets: Vec<usize>,
    ids: Vec<u32>,
}

impl Chunk {
    fn clear(&mut self) {
        self.records.clear();
        self.bad.clear();
        self.points.clear();
        self.sensors.clear();
        self.offsets.clear();
        self.offsets.push(0);
        self.ids.clear();
    }

    fn push(
        &mut self,
        record: csv::StringRecord,
        width: usize,
        layout: &Layout,
        cameras: Option<&Cameras>,
    ) {
        let fields = record.len();
        let parsed = (|| -> Result<(Vec3, Vec3, Vec<u32>), String> {
            if fields != width {
                return Err(format!(
                    "the row has {fields} fields but the header has {width}"
                ));
            }
            let p = Vec3::new(
                number(&record, layout.x, "x")?,
                number(&record, layout.y, "y")?,
                number(&record, layout.z, "z")?,
            );
            let s = match layout.sensor {
                Some([a, b, c]) => Vec3::new(
                    number(&record, a, "sensor_x")?,
                    number(&record, b, "sensor_y")?,
                    number(&record, c, "sensor_z")?,
                ),
                None => Vec3::NAN,
            };
            let mut ids = Vec::new();
            if let (Some(col), Some(cams)) = (layout.cameras, cameras) {
                let text = record.get(col).ok_or("column `cameras` is missing")?;
                for id in text
                    .split(|c: char| c == ';' || c == '|' || c.is_whitespace())
                    .filter(|s| !s.is_empty())
                {
                    match cams.ids.get(id) {
                        Some(&k) => ids.push(k),
                        None => return Err(format!("camera `{id}` is not in the cameras file")),
                    }
                }
            }
            Ok((p, s, ids))
        })();
        match parsed {
            Ok((p, s, ids)) => {
                self.points.push(p);
                self.sensors.push(s);
                self.ids.extend(ids);
                self.bad.push(None);
            }
            Err(message) => {
                self.points.push(Vec3::NAN);
                self.sensors.push(Vec3::NAN);
                self.bad.push(Some(message));
            }
        }
        self.offsets.push(self.ids.len());
        // Every output row has the header's width: pad a short row, cut a long one
        // (it is reported as bad_row either way).
        let mut record = record;
        if fields > width {
            record.truncate(width);
        }
        while record.len() < width {
            record.push_field("");
        }
        self.records.push(record);
    }
}

/// Counts for the summary.
#[derive(Default)]
struct Summary {
    rows: usize,
    by_status: [usize; Status::ALL.len()],
    bad_rows: usize,
    /// Corrected points that were below the surface (the depth statistics).
    below: usize,
    depth_sum_before: f64,
    depth_sum_after: f64,
    depth_max_after: f64,
    shift_max: f64,
}

impl Summary {
    fn failed(&self) -> usize {
        self.rows - self.ok()
    }
    fn ok(&self) -> usize {
        self.by_status.first().copied().unwrap_or(0)
    }
}

fn status_name(s: Status) -> &'static str {
    match s {
        Status::Ok => "ok",
        Status::NullPointer => "null_pointer",
        Status::InvalidArgument => "invalid_argument",
        Status::TotalInternalReflection => "total_internal_reflection",
        Status::MissesInterface => "misses_interface",
        Status::WrongSide => "wrong_side",
        Status::NotConverged => "not_converged",
        Status::OutOfRange => "out_of_range",
        Status::BufferTooSmall => "buffer_too_small",
        Status::Internal => "internal",
        Status::Degenerate => "degenerate",
    }
}

/// A progress display: an indicatif bar on a terminal, plain lines otherwise
/// (with `--progress always`), or nothing.
struct Meter {
    bar: Option<ProgressBar>,
    plain: bool,
    total: u64,
    next_plain: u64,
}

impl Meter {
    fn new(mode: Progress, total_bytes: u64) -> Meter {
        use std::io::IsTerminal;
        let terminal = io::stderr().is_terminal();
        let bar = match mode {
            Progress::Never => None,
            _ if terminal => {
                let bar =
                    ProgressBar::with_draw_target(Some(total_bytes), ProgressDrawTarget::stderr());
                if let Ok(style) = ProgressStyle::with_template(
                    "{spinner} [{elapsed_precise}] [{bar:40}] {percent:>3}% {msg} (eta {eta})",
                ) {
                    bar.set_style(style.progress_chars("=> "));
                }
                Some(bar)
            }
            _ => None,
        };
        Meter {
            bar,
            plain: mode == Progress::Always && !terminal,
            total: total_bytes.max(1),
            next_plain: total_bytes / 10,
        }
    }

    fn update(&mut self, bytes: u64, rows: usize) {
        if let Some(bar) = &self.bar {
            bar.set_position(bytes);
            bar.set_message(format!("{rows} rows"));
        } else if self.plain && bytes >= self.next_plain {
            eprintln!(
                "flatray-correct: {:3}% ({rows} rows)",
                (bytes * 100 / self.total).min(99)
            );
            self.next_plain = bytes + self.total / 10;
        }
    }

    fn finish(&self, rows: usize) {
        if let Some(bar) = &self.bar {
            bar.finish_and_clear();
        } else if self.plain {
            eprintln!("flatray-correct: 100% ({rows} rows)");
        }
    }
}

fn run(args: &Args) -> Result<Summary, Fatal> {
    let started = Instant::now();
    let Setup { stack, groups } = setup(args)?;
    let cameras = match (args.method, &args.cameras) {
        (Method::Views | Method::ViewsShortcut, Some(path)) => Some(read_cameras(path)?),
        (Method::Views | Method::ViewsShortcut, None) => {
            return Err(Fatal(
                "the views methods need --cameras FILE (columns id, x, y, z)".to_string(),
            ))
        }
        _ => None,
    };
    let input = File::open(&args.points).map_err(|e| {
        Fatal(format!(
            "cannot open the point file {}: {e}",
            args.points.display()
        ))
    })?;
    let total_bytes = input.metadata().map(|m| m.len()).unwrap_or(0);
    let mut reader = csv::ReaderBuilder::new()
        .flexible(true)
        .trim(csv::Trim::All)
        .from_reader(BufReader::with_capacity(1 << 20, input));
    let header = reader
        .headers()
        .map_err(|e| Fatal(format!("{}: {e}", args.points.display())))?
        .clone();
    let layout = layout(&header, args.method, &args.points)?;
    let output = File::create(&args.output).map_err(|e| {
        Fatal(format!(
            "cannot create the output file {}: {e}",
            args.output.display()
        ))
    })?;
    let mut writer = csv::Writer::from_writer(BufWriter::with_capacity(1 << 20, output));
    let multiview = matches!(args.method, Method::Views | Method::ViewsShortcut);
    let mut out_header = header.clone();
    out_header.push_field("true_x");
    out_header.push_field("true_y");
    out_header.push_field("true_z");
    if multiview {
        out_header.push_field("rms_miss_m");
    }
    out_header.push_field("status");
    out_header.push_field("detail");
    writer.write_record(&out_header)?;

    let mut summary = Summary::default();
    let mut meter = Meter::new(args.progress, total_bytes);
    let mut chunk = Chunk::default();
    chunk.clear();
    let mut lines = Vec::with_capacity(CHUNK);
    let mut records = reader.into_records();
    let mut done = false;
    while !done {
        chunk.clear();
        lines.clear();
        while chunk.records.len() < CHUNK {
            match records.next() {
                None => {
                    done = true;
                    break;
                }
                Some(Ok(record)) => {
                    lines.push(record.position().map_or(0, |p| p.line()));
                    chunk.push(record, header.len(), &layout, cameras.as_ref());
                }
                Some(Err(e)) => {
                    // A row the CSV reader itself cannot read (bad quoting,
                    // invalid UTF-8): keep it in the output as a bad row.
                    let line = e.position().map_or(0, |p| p.line());
                    lines.push(line);
                    let mut empty = csv::StringRecord::new();
                    for _ in 0..header.len() {
                        empty.push_field("");
                    }
                    chunk.records.push(empty);
                    chunk.bad.push(Some(format!("unreadable row: {e}")));
                    chunk.points.push(Vec3::NAN);
                    chunk.sensors.push(Vec3::NAN);
                    chunk.offsets.push(chunk.ids.len());
                }
            }
        }
        let n = chunk.records.len();
        if n == 0 {
            break;
        }
        let mut out = vec![Vec3::NAN; n];
        let mut rms = vec![f64::NAN; n];
        let mut status = vec![Status::Ok; n];
        let image = match args.image {
            ImageArg::Sagittal => Image::Sagittal,
            ImageArg::Tangential => Image::Tangential,
        };
        match args.method {
            Method::Range => correct_ranges(
                &stack,
                &chunk.sensors,
                &chunk.points,
                Some(&groups),
                &mut out,
                &mut status[..],
            ),
            Method::SingleView => batch::true_positions(
                &stack,
                &chunk.sensors,
                &chunk.points,
                image,
                &mut out,
                &mut status[..],
            ),
            Method::Views | Method::ViewsShortcut => {
                let cams = cameras.as_ref().map_or(&[][..], |c| &c.centres[..]);
                let views = Views {
                    cameras: cams,
                    offsets: &chunk.offsets,
                    ids: &chunk.ids,
                };
                let method = if args.method == Method::Views {
                    Multiview::Exact
                } else {
                    Multiview::Shortcut
                };
                correct_multiviews(
                    &stack,
                    &views,
                    &chunk.points,
                    method,
                    &mut out,
                    Some(&mut rms),
                    &mut status[..],
                )
            }
        }
        .map_err(|e| Fatal(format!("internal batch error: {e}")))?;

        for i in 0..n {
            let mut record = chunk.records[i].clone();
            let (name, detail) = match &chunk.bad[i] {
                Some(message) => {
                    summary.bad_rows += 1;
                    if summary.bad_rows <= REPORTED_BAD_ROWS {
                        eprintln!(
                            "flatray-correct: {}: line {}: {message}",
                            args.points.display(),
                            lines[i]
                        );
                    }
                    out[i] = Vec3::NAN;
                    rms[i] = f64::NAN;
                    ("bad_row", message.clone())
                }
                None => {
                    let s = status[i];
                    if let Some(slot) = summary.by_status.get_mut(s.code() as usize) {
                        *slot += 1;
                    }
                    if s == Status::Ok && chunk.points[i].z < args.surface_z {
                        let before = args.surface_z - chunk.points[i].z;
                        let after = args.surface_z - out[i].z;
                        summary.depth_sum_before += before;
                        summary.depth_sum_after += after;
                        summary.depth_max_after = summary.depth_max_after.max(after);
                        summary.shift_max =
                            summary.shift_max.max((out[i] - chunk.points[i]).length());
                        summary.below += 1;
                        (status_name(s), String::new())
                    } else if s == Status::Ok {
                        (status_name(s), String::new())
                    } else {
                        (status_name(s), s.message().to_string())
                    }
                }
            };
            let fmt = |v: f64| {
                if v.is_nan() {
                    String::new()
                } else {
                    v.to_string()
                }
            };
            record.push_field(&fmt(out[i].x));
            record.push_field(&fmt(out[i].y));
            record.push_field(&fmt(out[i].z));
            if multiview {
                record.push_field(&fmt(rms[i]));
            }
            record.push_field(name);
            record.push_field(&detail);
            writer.write_record(&record)?;
        }
        summary.rows += n;
        let bytes = records.reader().position().byte();
        meter.update(bytes, summary.rows);
    }
    writer.flush()?;
    meter.finish(summary.rows);
    if summary.bad_rows > REPORTED_BAD_ROWS {
        eprintln!(
            "flatray-correct: ... and {} more malformed rows (status bad_row in the output)",
            summary.bad_rows - REPORTED_BAD_ROWS
        );
    }
    print_summary(
        args,
        &stack,
        &groups,
        &summary,
        started.elapsed().as_secs_f64(),
    );
    Ok(summary)
}

fn print_summary(args: &Args, stack: &Stack, groups: &GroupIndices, s: &Summary, seconds: f64) {
    let method = match args.method {
        Method::Range => "range",
        Method::Views => "views",
        Method::ViewsShortcut => "views-shortcut (approximation)",
        Method::SingleView => "single-view",
    };
    let mut out = io::stdout().lock();
    let _ = writeln!(out, "flatray-correct summary");
    let _ = writeln!(out, "  input            {}", args.points.display());
    let _ = writeln!(out, "  output           {}", args.output.display());
    let _ = writeln!(out, "  method           {method}");
    let _ = writeln!(
        out,
        "  indices          air {:.6}, water {:.6} (surface at z = {} m)",
        stack.n_observer(),
        stack.n_object(),
        args.surface_z
    );
    if args.method == Method::Range {
        let g = groups.as_slice();
        let _ = writeln!(
            out,
            "  group indices    air {:.6}, water {:.6}",
            g.first().copied().unwrap_or(f64::NAN),
            g.get(1).copied().unwrap_or(f64::NAN)
        );
    }
    let _ = writeln!(out, "  rows             {}", s.rows);
    let _ = writeln!(out, "  corrected        {}", s.ok());
    for (status, &count) in Status::ALL.iter().zip(s.by_status.iter()).skip(1) {
        if count > 0 {
            let _ = writeln!(out, "  {:<16} {count}", status_name(*status));
        }
    }
    if s.bad_rows > 0 {
        let _ = writeln!(out, "  bad_row          {}", s.bad_rows);
    }
    if s.below > 0 {
        let k = s.below as f64;
        let _ = writeln!(
            out,
            "  mean depth       {:.3} m before, {:.3} m after (deepest {:.3} m) over {} points under water; largest shift {:.3} m",
            s.depth_sum_before / k,
            s.depth_sum_after / k,
            s.depth_max_after,
            s.below,
            s.shift_max
        );
    }
    let _ = writeln!(
        out,
        "  time             {seconds:.2} s ({:.0} rows/s)",
        s.rows as f64 / seconds.max(1e-9)
    );
}
