package report

import (
	"bufio"
	"fmt"
	"io/fs"
	"strings"
)

// Section names, as written in sections.txt and in the [report] sections
// list of the configuration.
const (
	SectionCover       = "cover"       // firm, portfolio, as-of date, run
	SectionSummary     = "summary"     // one page for the committee
	SectionHoldings    = "holdings"    // weights, sectors, concentration
	SectionSensitivity = "sensitivity" // rate and growth durations, curve, explanation
	SectionReturns     = "returns"     // returns and rolling volatility
	SectionVaR         = "var"         // VaR, ES and backtest
	SectionStress      = "stress"      // scenarios and replays
	SectionHistory     = "history"     // headline metrics across runs
	SectionMethodology = "methodology" // models, conventions, parameters
	SectionCautions    = "cautions"    // what the figures are not
	SectionAppendix    = "appendix"    // exclusions, findings, hashes
)

// SectionNames returns every section the renderer knows, in the order of
// the shipped sections.txt.
func SectionNames() []string {
	return []string{
		SectionCover, SectionSummary, SectionHoldings, SectionSensitivity,
		SectionReturns, SectionVaR, SectionStress, SectionHistory,
		SectionMethodology, SectionCautions, SectionAppendix,
	}
}

// ValidSection reports whether name is a section the renderer knows.
func ValidSection(name string) bool {
	for _, s := range SectionNames() {
		if s == name {
			return true
		}
	}
	return false
}

// CheckSections returns an error naming the first unknown or repeated
// section of list, or nil.
func CheckSections(list []string) error {
	if len(list) == 0 {
		return fmt.Errorf("report: section list is empty: %w", ErrSection)
	}
	seen := map[string]bool{}
	for _, s := range list {
		if !ValidSection(s) {
			return fmt.Errorf("report: unknown section %q (known: %s): %w", s, strings.Join(SectionNames(), ", "), ErrSection)
		}
		if seen[s] {
			return fmt.Errorf("report: section %q listed twice: %w", s, ErrSection)
		}
		seen[s] = true
	}
	return nil
}

// readSections reads sections.txt: one name a line, blank lines and lines
// starting with # ignored.
func readSections(fsys fs.FS) ([]string, error) {
	f, err := fsys.Open(fileSections)
	if err != nil {
		return nil, fmt.Errorf("report: texts: %w", err)
	}
	defer f.Close()
	var list []string
	sc := bufio.NewScanner(f)
	line := 0
	for sc.Scan() {
		line++
		s := strings.TrimSpace(sc.Text())
		if s == "" || strings.HasPrefix(s, "#") {
			continue
		}
		if !ValidSection(s) {
			return nil, fmt.Errorf("report: %s: line %d: unknown section %q: %w", fileSections, line, s, ErrSection)
		}
		list = append(list, s)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("report: %s: %w", fileSections, err)
	}
	if err := CheckSections(list); err != nil {
		return nil, fmt.Errorf("report: %s: %w", fileSections, err)
	}
	return list, nil
}
