// Package config reads heliocal's configuration file: deployment settings,
// the sites events are computed for, and the feeds (subscribable calendars)
// with their event kinds.
//
// The file is YAML (TOML and JSON are read the same way). Parse and Load
// decode it strictly (unknown keys, text where a number belongs, bare
// numbers where a duration belongs are errors), apply the defaults, and
// validate it; every problem is reported at once in a *ValidationError whose
// lines each name the field path and the offending value:
//
//	sites[2].latitude: 95: must be within -90..90 (decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S)
//
// The kind vocabulary (KindNames, ParseKind) is file syntax and lives here;
// what each kind means is computed by package feed.
//
// Deployment settings can be overridden from the environment (EnvNames);
// the environment is passed in (ParseEnv, LoadEnv, Resolve) rather than read
// here, so tests never depend on the process environment. Resolve picks the
// file the command line uses: --config, else ./heliocal.yaml, else the
// built-in demo (demo.yaml, embedded).
//
// This is the only package that imports viper.
package config
