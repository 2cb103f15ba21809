#!/usr/bin/env bash
# The main demo: flatray's three invented scenarios, one after the other.
#   reef_survey     apparent and true depths from a drone, a camera port, and the
#                   effect of the water model (media) on a corrected depth
#   lagoon_survey   survey corrections: multi-view points, a laser profile, the
#                   error budget, and a plot of the correction factor
#   camera_housing  a camera behind a flat port: field of view, pinhole-in-water
#                   errors, and an error map picture
# Pictures go to target/flatray-demo/.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet --examples
for demo in reef_survey lagoon_survey camera_housing; do
  printf '\n======== %s ========\n\n' "$demo"
  "target/release/examples/$demo"
done
