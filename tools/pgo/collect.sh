#!/usr/bin/env bash
# Collects the CPU profile that `go build ./cmd/heliocal` uses for
# profile-guided optimisation (cmd/heliocal/default.pgo: the go command
# picks it up by itself, for every build and test of the main package).
# It runs the benchmarks of the work users wait for, each with
# -cpuprofile, and merges the profiles:
#
#   - the 20-year events listing (cmd/heliocal BenchmarkEventsCommand20Years),
#   - an ad-hoc one-year feed as the server builds it (BenchmarkAdhocFeed),
#   - publishing 50 sites × 400 days (feed/publish BenchmarkPublishFleet).
#
# Run it from anywhere in the repository after a change that moves the
# work around (DEVELOPERS.md, "Profile-guided optimisation"). On two cores
# it takes 10-20 s after a change (4 s of benchmarks, the rest compiles
# the two test binaries), 75 s with an empty build cache. Usage:
# tools/pgo/collect.sh [output, default cmd/heliocal/default.pgo]
set -euo pipefail
cd "$(dirname "$0")/../.."
out=${1:-cmd/heliocal/default.pgo}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp" "$out.new"' EXIT
go test -c -o "$tmp/cmd.test" ./cmd/heliocal
go test -c -o "$tmp/publish.test" ./feed/publish
# the benchmarks read testdata relative to their package's directory
(cd cmd/heliocal && "$tmp/cmd.test" -test.run '^$' -test.bench 'EventsCommand20Years$' -test.benchtime 100x \
  -test.cpuprofile "$tmp/events.pprof" >/dev/null)
(cd cmd/heliocal && "$tmp/cmd.test" -test.run '^$' -test.bench 'AdhocFeed$' -test.benchtime 500x \
  -test.cpuprofile "$tmp/adhoc.pprof" >/dev/null)
(cd feed/publish && "$tmp/publish.test" -test.run '^$' -test.bench 'PublishFleet/feeds=50$' -test.benchtime 5x \
  -test.cpuprofile "$tmp/publish.pprof" >/dev/null)
# written beside the output and renamed over it: a mv from another file
# system (a tmpfs /tmp) would copy, and could leave it half-written
go tool pprof -proto "$tmp/events.pprof" "$tmp/adhoc.pprof" "$tmp/publish.pprof" >"$out.new" 2>/dev/null
mv "$out.new" "$out"
echo "wrote $out ($(wc -c <"$out") bytes)"
