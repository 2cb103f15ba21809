//! Through-water survey corrections: points seen from several cameras, laser
//! ranges, depth tables and error budgets.
//!
//! Surveys that ignore refraction put a river bed or reef floor too shallow, by
//! about a quarter of the depth at nadir and more at oblique views. This module
//! corrects such data:
//!
//! * [`triangulate`](crate::survey::triangulate()): lines of sight from cameras (e.g. from image
//!   measurements), each traced through the stack, and the least-squares point
//!   of the refracted rays. The exact method when the image measurements are at
//!   hand.
//! * [`correct_multiview`](crate::survey::correct_multiview): an existing point cloud triangulated as if light
//!   travelled straight, plus the centres of the cameras that saw each point:
//!   the true point whose exact lines of sight reproduce the uncorrected point,
//!   solved by Newton's method. [`correct_multiview_shortcut`](crate::survey::correct_multiview_shortcut) is the common
//!   approximation, kept for comparison.
//! * [`correct_range`](crate::survey::correct_range): laser ranges that assumed a straight beam at the
//!   observer medium's group velocity, refracted and rescaled by each medium's
//!   group index.
//! * [`depth_table`](crate::survey::depth_table): the single-interface depth helpers over slices, and the
//!   correction factor (true / apparent depth) against viewing angle.
//! * [`sensitivity`](crate::survey::sensitivity): partial derivatives of a corrected point and a
//!   first-order propagated covariance (the error budget).
//!
//! Every per-point function has a batch form over caller slices with a status
//! per point (the rules of [`crate::batch`]); large batches use every core with
//! the `parallel` feature ([`parallel`](crate::survey::parallel)).
//!
//! All least-squares line intersections go through [`crate::lines`].

pub mod depth_table;
pub mod multiview;
pub mod parallel;
pub mod range;
pub mod sensitivity;
pub mod triangulate;

pub use depth_table::{
    apparent_depths, correction_factor, correction_factors, nadir_correction_factor, true_depths,
    CLEAR_WATER_NADIR_FACTOR,
};
pub use multiview::{
    correct_multiview, correct_multiview_shortcut, correct_multiview_with, correct_multiviews,
    Multiview, MultiviewOptions, Views,
};
pub use range::{correct_range, correct_ranges, GroupIndices};
pub use sensitivity::{
    true_position_covariance, true_position_covariances, true_position_sensitivity, Covariance,
    Sensitivity, Uncertainty,
};
pub use triangulate::{triangulate, triangulations};
