package main

import (
	"os"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/spf13/cobra"
	"golang.org/x/term"

	"heliocal/config"
)

// Help text is written as paragraphs and reflowed to the width of the
// terminal it is shown on (80 columns when it is not a terminal, at most
// 120): a paragraph whose lines all start at the margin is refilled; an
// indented line (a table row such as "  Sun:  sunrise, sunset…") is wrapped
// with its continuation aligned under its second column.

const (
	defaultHelpWidth = 80
	minHelpWidth     = 40
	maxHelpWidth     = 120
)

// helpWidth is the number of columns help text may use on w.
func helpWidth(w any, getenv func(string) (string, bool)) int {
	width := 0
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		width, _, _ = term.GetSize(int(f.Fd()))
	}
	if width <= 0 {
		if v, ok := getenv("COLUMNS"); ok {
			width, _ = strconv.Atoi(v)
		}
	}
	if width <= 0 {
		width = defaultHelpWidth
	}
	return min(max(width-1, minHelpWidth), maxHelpWidth)
}

// installHelp makes every command's help reflow to the terminal: the long
// description through wrapText, the flag lists through pflag's wrapping.
// The usage template that wraps the flags and the list of kinds (see
// kindsHelpMark) are made when a help or a usage is written, not at every
// start (≈ 60,000 and 90,000 instructions).
func installHelp(root *cobra.Command, g *globals) {
	width := func() int { return helpWidth(g.stdout, g.getenv) }
	cobra.AddTemplateFunc("helpWidth", width)
	wrapped := false
	defaultUsage := root.UsageFunc()
	root.SetUsageFunc(func(cmd *cobra.Command) error {
		if !wrapped {
			root.SetUsageTemplate(strings.NewReplacer(
				".LocalFlags.FlagUsages", "(.LocalFlags.FlagUsagesWrapped helpWidth)",
				".InheritedFlags.FlagUsages", "(.InheritedFlags.FlagUsagesWrapped helpWidth)",
			).Replace(root.UsageTemplate()))
			wrapped = true
		}
		return defaultUsage(cmd)
	})
	defaultHelp := root.HelpFunc()
	root.SetHelpFunc(func(cmd *cobra.Command, args []string) {
		long := cmd.Long
		cmd.Long = wrapText(strings.Replace(long, kindsHelpMark, kindsHelp(), 1), width())
		defaultHelp(cmd, args)
		cmd.Long = long
	})
}

// kindsHelpMark stands in a command's long description for the list of
// kinds (kindsHelp), which its help writes in.
const kindsHelpMark = "\x00kinds\x00"

// wrapText reflows text to width columns (see the comment at the top).
func wrapText(text string, width int) string {
	paras := strings.Split(text, "\n\n")
	for i, p := range paras {
		lines := strings.Split(p, "\n")
		indented := false
		for _, l := range lines {
			if strings.HasPrefix(l, " ") {
				indented = true
			}
		}
		if !indented {
			paras[i] = strings.Join(fill(strings.Fields(p), width, "", ""), "\n")
			continue
		}
		var out []string
		for _, l := range lines {
			if !strings.HasPrefix(l, " ") || utf8.RuneCountInString(l) <= width {
				out = append(out, l)
				continue
			}
			hb := hangColumn(l)
			out = append(out, fill(strings.Fields(l[hb:]), width, l[:hb], strings.Repeat(" ", hb))...)
		}
		paras[i] = strings.Join(out, "\n")
	}
	return strings.Join(paras, "\n\n")
}

// hangColumn is the byte offset where an indented row's second column
// starts: after the first run of two or more spaces that follows text; the
// row's own indent if there is none. The row's head before it is ASCII
// (labels such as "Sun:" or "2"), so bytes and columns agree.
func hangColumn(l string) int {
	body := strings.TrimLeft(l, " ")
	indent := len(l) - len(body)
	if i := strings.Index(body, "  "); i > 0 {
		j := i
		for j < len(body) && body[j] == ' ' {
			j++
		}
		return indent + j
	}
	return indent
}

// fill lays words into lines of at most width columns (a longer word gets a
// line of its own); the first line starts with first, the others with rest.
func fill(words []string, width int, first, rest string) []string {
	var lines []string
	line := first
	n := utf8.RuneCountInString(first)
	start := true
	for _, w := range words {
		wn := utf8.RuneCountInString(w)
		if !start && n+1+wn > width {
			lines = append(lines, line)
			line, n, start = rest, utf8.RuneCountInString(rest), true
		}
		if !start {
			line += " "
			n++
		}
		line += w
		n += wn
		start = false
	}
	return append(lines, line)
}

// kindsHelp lists the kinds by family, one row per family, parametrised
// kinds written with their parameter ("sun-altitude:<degrees>").
func kindsHelp() string {
	families := []struct{ id, label string }{
		{config.FamilySun, "Sun:"}, {config.FamilyTwilight, "Twilight:"},
		{config.FamilyYear, "Year:"}, {config.FamilyMoon, "Moon:"}, {config.FamilyEclipse, "Eclipses:"},
	}
	rows := map[string][]string{}
	var other []string
	for i, ex := range config.KindExamples {
		k, err := config.ParseKind(ex)
		if err != nil {
			continue
		}
		word := config.KindNames[i]
		if _, param, ok := strings.Cut(ex, ":"); ok {
			if strings.Contains(param, "..") {
				word += ":<low>..<high>" // two altitudes in degrees
			} else if _, err := strconv.ParseFloat(param, 64); err == nil {
				word += ":<degrees>"
			} else {
				word += ":<duration>"
			}
		}
		known := false
		for _, f := range families {
			if k.Family() == f.id {
				rows[f.id] = append(rows[f.id], word)
				known = true
			}
		}
		if !known {
			other = append(other, word)
		}
	}
	var b strings.Builder
	b.WriteString("Kinds (comma-separated), by family:")
	for _, f := range families {
		if len(rows[f.id]) > 0 {
			b.WriteString("\n  " + f.label + strings.Repeat(" ", 11-len(f.label)) + strings.Join(rows[f.id], ", "))
		}
	}
	if len(other) > 0 {
		b.WriteString("\n  Other:     " + strings.Join(other, ", "))
	}
	return b.String()
}
