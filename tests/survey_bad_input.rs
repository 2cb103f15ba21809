//! Bad input to the survey functions: a camera under water, a point above the
//! surface, parallel lines of sight, one view, NaN rows, wrong group-index
//! counts. Each must give its documented status, never a guess.

use flatray::survey::{
    correct_multiview, correct_multiview_shortcut, correct_multiviews, correct_range,
    correct_ranges, triangulate, GroupIndices, Multiview, Views,
};
use flatray::{Layer, NoStatus, Ray, Stack, Status, Vec3};

fn lake() -> Stack {
    Stack::single_interface(Vec3::ZERO, Vec3::new(0.0, 0.0, -1.0), 1.000_28, 1.339).unwrap()
}

fn status<T: std::fmt::Debug>(r: flatray::Result<T>) -> Status {
    r.unwrap_err().status()
}

#[test]
fn multiview_bad_input() {
    let s = lake();
    let seen = Vec3::new(1.0, 2.0, -1.5);
    let cams = [Vec3::new(0.0, 0.0, 30.0), Vec3::new(10.0, 0.0, 32.0)];
    for f in [correct_multiview, correct_multiview_shortcut] {
        // One view only, or none.
        assert_eq!(status(f(&s, &cams[..1], seen)), Status::Degenerate);
        assert_eq!(status(f(&s, &[], seen)), Status::Degenerate);
        // A camera under water.
        let under = [cams[0], Vec3::new(5.0, 0.0, -0.5)];
        assert_eq!(status(f(&s, &under, seen)), Status::WrongSide);
        // The uncorrected point above the surface.
        assert_eq!(
            status(f(&s, &cams, Vec3::new(1.0, 2.0, 0.5))),
            Status::WrongSide
        );
        // Parallel lines of sight: two cameras on one vertical over the point.
        let stacked = [Vec3::new(1.0, 2.0, 30.0), Vec3::new(1.0, 2.0, 45.0)];
        assert_eq!(status(f(&s, &stacked, seen)), Status::Degenerate);
        // Two cameras at the same place.
        assert_eq!(status(f(&s, &[cams[0], cams[0]], seen)), Status::Degenerate);
        // NaN anywhere.
        assert_eq!(
            status(f(&s, &cams, Vec3::new(f64::NAN, 0.0, -1.0))),
            Status::InvalidArgument
        );
        let nan_cam = [cams[0], Vec3::new(0.0, f64::INFINITY, 30.0)];
        assert_eq!(status(f(&s, &nan_cam, seen)), Status::InvalidArgument);
    }
}

#[test]
fn triangulate_bad_input() {
    let s = lake();
    let down = Vec3::new(0.05, 0.0, -1.0);
    let a = Ray::new(Vec3::new(0.0, 0.0, 30.0), down);
    let b = Ray::new(Vec3::new(4.0, 0.0, 30.0), Vec3::new(-0.05, 0.0, -1.0));
    assert!(triangulate(&s, &[a, b]).is_ok());
    assert_eq!(status(triangulate(&s, &[a])), Status::Degenerate);
    assert_eq!(status(triangulate(&s, &[])), Status::Degenerate);
    // Parallel lines of sight stay parallel after refraction.
    let c = Ray::new(Vec3::new(3.0, 0.0, 30.0), down);
    assert_eq!(status(triangulate(&s, &[a, c])), Status::Degenerate);
    // A camera under water.
    let wet = Ray::new(Vec3::new(3.0, 0.0, -1.0), down);
    assert_eq!(status(triangulate(&s, &[a, wet])), Status::WrongSide);
    // A line looking up, away from the water.
    let up = Ray::new(Vec3::new(3.0, 0.0, 30.0), Vec3::new(0.0, 0.0, 1.0));
    assert_eq!(status(triangulate(&s, &[a, up])), Status::MissesInterface);
    // Diverging rays meet above the water.
    let away = Ray::new(Vec3::new(3.0, 0.0, 30.0), Vec3::new(0.2, 0.0, -1.0));
    assert_eq!(status(triangulate(&s, &[a, away])), Status::WrongSide);
    // NaN rows.
    let nan = Ray::new(Vec3::new(f64::NAN, 0.0, 30.0), down);
    assert_eq!(status(triangulate(&s, &[a, nan])), Status::InvalidArgument);
    let zero = Ray::new(Vec3::new(3.0, 0.0, 30.0), Vec3::ZERO);
    assert_eq!(status(triangulate(&s, &[a, zero])), Status::InvalidArgument);
}

#[test]
fn range_bad_input() {
    let s = lake();
    let sensor = Vec3::new(0.0, 0.0, 20.0);
    let p = Vec3::new(1.0, 0.0, -2.0);
    // A sensor under water.
    assert_eq!(
        status(correct_range(&s, Vec3::new(0.0, 0.0, -0.1), p, None)),
        Status::WrongSide
    );
    // Group indices: wrong count, non-positive values.
    let three = GroupIndices::new(&[1.0, 1.5, 1.36]).unwrap();
    assert_eq!(
        status(correct_range(&s, sensor, p, Some(&three))),
        Status::InvalidArgument
    );
    assert_eq!(status(GroupIndices::new(&[1.0])), Status::InvalidArgument);
    assert_eq!(
        status(GroupIndices::new(&[1.0, 0.0])),
        Status::InvalidArgument
    );
    assert_eq!(
        status(GroupIndices::new(&[1.0, f64::NAN])),
        Status::InvalidArgument
    );
    // NaN rows.
    assert_eq!(
        status(correct_range(
            &s,
            sensor,
            Vec3::new(f64::NAN, 0.0, -1.0),
            None
        )),
        Status::InvalidArgument
    );
    // Batches: a NaN row and a wet sensor fail alone; a wrong group count fails
    // the whole call before anything is written.
    let sensors = [sensor, Vec3::new(0.0, 0.0, -1.0), sensor];
    let points = [p, p, Vec3::new(0.0, f64::NAN, -1.0)];
    let mut out = [Vec3::ZERO; 3];
    let mut st = [Status::Ok; 3];
    let report = correct_ranges(&s, &sensors, &points, None, &mut out, &mut st[..]).unwrap();
    assert_eq!(report.failed, 2);
    assert_eq!(st, [Status::Ok, Status::WrongSide, Status::InvalidArgument]);
    assert!(out[1].x.is_nan() && out[2].z.is_nan());
    let mut untouched = [Vec3::ZERO; 3];
    assert_eq!(
        status(correct_ranges(
            &s,
            &sensors,
            &points,
            Some(&three),
            &mut untouched,
            &mut NoStatus
        )),
        Status::InvalidArgument
    );
    assert_eq!(untouched, [Vec3::ZERO; 3]);
    assert_eq!(
        status(correct_ranges(
            &s,
            &sensors[..2],
            &points,
            None,
            &mut untouched,
            &mut NoStatus
        )),
        Status::InvalidArgument
    );
    // The group count follows the layers.
    let port = Stack::new(
        Vec3::ZERO,
        Vec3::new(0.0, 0.0, 1.0),
        1.0,
        &[Layer::new(0.01, 1.5)],
        1.33,
    )
    .unwrap();
    assert!(correct_range(
        &port,
        Vec3::new(0.0, 0.0, -0.1),
        Vec3::new(0.0, 0.0, 0.5),
        Some(&three)
    )
    .is_ok());
}

#[test]
fn multiview_batch_bad_input() {
    let s = lake();
    let cams = [
        Vec3::new(0.0, 0.0, 30.0),
        Vec3::new(10.0, 0.0, 32.0),
        Vec3::new(0.0, 0.0, -1.0),
    ];
    let seen = [
        Vec3::new(1.0, 2.0, -1.5),
        Vec3::new(1.0, 2.0, -1.5),
        Vec3::new(1.0, 2.0, -1.5),
        Vec3::new(f64::NAN, 2.0, -1.5),
        Vec3::new(1.0, 2.0, 1.5),
    ];
    // Point 1: one view; point 2: camera id 7 does not exist; point 0 fine;
    // point 3: NaN row; point 4: above the surface.
    let ids = [0u32, 1, 0, 0, 7, 0, 1, 0, 1];
    let offsets = [0usize, 2, 3, 5, 7, 9];
    let views = Views {
        cameras: &cams,
        offsets: &offsets,
        ids: &ids,
    };
    let mut out = [Vec3::ZERO; 5];
    let mut rms = [0.0; 5];
    let mut st = [Status::Ok; 5];
    let report = correct_multiviews(
        &s,
        &views,
        &seen,
        Multiview::Exact,
        &mut out,
        Some(&mut rms),
        &mut st[..],
    )
    .unwrap();
    assert_eq!(
        st,
        [
            Status::Ok,
            Status::Degenerate,
            Status::InvalidArgument,
            Status::InvalidArgument,
            Status::WrongSide
        ]
    );
    assert_eq!(report.failed, 4);
    assert_eq!(report.first_failure.unwrap().0, 1);
    assert!(out[1].x.is_nan() && rms[1].is_nan() && !rms[0].is_nan());
    // Malformed offsets are whole-call errors.
    let bad = Views {
        cameras: &cams,
        offsets: &[0, 3, 2, 5, 7, 9],
        ids: &ids,
    };
    assert_eq!(
        status(correct_multiviews(
            &s,
            &bad,
            &seen,
            Multiview::Exact,
            &mut out,
            None,
            &mut NoStatus
        )),
        Status::InvalidArgument
    );
    let short = Views {
        cameras: &cams,
        offsets: &offsets[..4],
        ids: &ids,
    };
    assert_eq!(
        status(correct_multiviews(
            &s,
            &short,
            &seen,
            Multiview::Exact,
            &mut out,
            None,
            &mut NoStatus
        )),
        Status::InvalidArgument
    );
    let past = Views {
        cameras: &cams,
        offsets: &[0, 2, 3, 5, 7, 10],
        ids: &ids,
    };
    assert_eq!(
        status(correct_multiviews(
            &s,
            &past,
            &seen,
            Multiview::Exact,
            &mut out,
            None,
            &mut NoStatus
        )),
        Status::InvalidArgument
    );
}
