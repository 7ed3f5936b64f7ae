package main

import (
	"strings"

	"github.com/spf13/cobra"

	"heliocal/config"
)

// Shell completion of flag values: site and feed ids from the
// configuration the command line names (or ./heliocal.yaml, or the demo),
// time zone names from the tz database heliocal carries, and event kinds,
// each with a one-line description where the shell shows one.

type completeFunc = func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective)

// completeFromConfig offers what list returns for the configuration in
// force. A configuration on standard input is not read while completing,
// and one that does not load offers nothing.
func completeFromConfig(g *globals, list func(*config.Config) []string) completeFunc {
	return func(_ *cobra.Command, _ []string, toComplete string) ([]string, cobra.ShellCompDirective) {
		if g.configPath == stdinPath {
			return nil, cobra.ShellCompDirectiveNoFileComp
		}
		cfg, _, err := loadConfig(g)
		if err != nil {
			return nil, cobra.ShellCompDirectiveNoFileComp
		}
		var out []string
		for _, c := range list(cfg) {
			if strings.HasPrefix(c, toComplete) {
				out = append(out, c)
			}
		}
		return out, cobra.ShellCompDirectiveNoFileComp
	}
}

func siteIDs(cfg *config.Config) []string {
	out := make([]string, len(cfg.Sites))
	for i, s := range cfg.Sites {
		out[i] = s.ID + "\t" + s.Name
	}
	return out
}

func feedIDs(cfg *config.Config) []string {
	out := make([]string, len(cfg.Feeds))
	for i, f := range cfg.Feeds {
		out[i] = f.ID + "\t" + f.Title
	}
	return out
}

// completeZones offers the tz database's zone names; case is ignored, so
// "europe/v" finds Europe/Vienna.
func completeZones(_ *cobra.Command, _ []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	var out []string
	for _, z := range config.ZoneNames() {
		if len(z) >= len(toComplete) && strings.EqualFold(z[:len(toComplete)], toComplete) {
			out = append(out, z)
		}
	}
	return out, cobra.ShellCompDirectiveNoFileComp
}

// completeKinds completes the last kind of a comma-separated list: after
// "sunrise,sun" it offers "sunrise,sunset", "sunrise,sun-altitude:"….
// Kinds written with a parameter are offered up to their colon.
func completeKinds(_ *cobra.Command, _ []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	done, last := "", toComplete
	if i := strings.LastIndex(toComplete, ","); i >= 0 {
		done, last = toComplete[:i+1], toComplete[i+1:]
	}
	chosen := map[string]bool{}
	for _, k := range strings.Split(done, ",") {
		chosen[strings.ToLower(strings.TrimSpace(k))] = true
	}
	var out []string
	for i, name := range config.KindNames {
		word := name
		if k, err := config.ParseKind(config.KindExamples[i]); err == nil && strings.Contains(config.KindExamples[i], ":") {
			word = k.Name + ":"
		}
		if !chosen[word] && strings.HasPrefix(word, strings.ToLower(last)) {
			out = append(out, done+word+"\t"+config.KindDoc(name))
		}
	}
	return out, cobra.ShellCompDirectiveNoFileComp | cobra.ShellCompDirectiveNoSpace
}
