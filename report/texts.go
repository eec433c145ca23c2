package report

import (
	"bytes"
	"errors"
	"fmt"
	htmltemplate "html/template"
	"io/fs"
	"maps"
	"slices"
	"strings"
	"text/template"
	"time"

	"plumbline/risk/pack"
	"plumbline/templates"
)

// Files of the texts folder (templates/report, or an override folder with
// the same file names).
const (
	fileSections   = "sections.txt"
	fileFooter     = "footer.tmpl"
	fileEmailSubj  = "email_subject.tmpl"
	fileEmailText  = "email_text.tmpl"
	fileEmailHTML  = "email_html.tmpl"
	templateSuffix = ".tmpl"
)

// overlay serves a file from over when it has it, else from base: an
// override folder needs only the files it changes.
type overlay struct{ over, base fs.FS }

func (o overlay) Open(name string) (fs.File, error) {
	if o.over != nil {
		f, err := o.over.Open(name)
		if err == nil {
			return f, nil
		}
		if !errors.Is(err, fs.ErrNotExist) {
			return nil, err
		}
	}
	return o.base.Open(name)
}

// textsFS returns the texts with override over the embedded defaults.
func textsFS(override fs.FS) fs.FS {
	return overlay{over: override, base: templates.Report()}
}

// TextData is what the text templates see. Templates print figures with
// the functions pct, pp, bp, money, years, convexity, num and metric,
// which accept float64 or *float64 and print "n/a" for nil.
type TextData struct {
	Doc  *pack.Document
	Meta Meta
	// Headline is the summary's table of headline figures.
	Headline []Figure
	// Breaches and Warnings are the limits in those states; Flagged the
	// drift items flagged this run.
	Breaches []pack.LimitStatus
	Warnings []pack.LimitStatus
	Flagged  []pack.DriftItem
	// Cautions is the text of cautions.tmpl "body", for the e-mails.
	Cautions string
}

// Figure is one headline figure, formatted.
type Figure struct {
	Metric   string // pack metric name, "" for figures not tracked across runs
	Label    string
	Value    string
	Previous string // "" when not tracked
	Change   string // "" when not tracked
	Z        string
	Flagged  bool
}

// funcs are the template functions; money uses the document's currency.
func funcs(ccy string) map[string]any {
	f := func(fn func(float64) string) func(any) string {
		return func(v any) string {
			x, ok := toFloat(v)
			if !ok {
				return NA
			}
			return fn(x)
		}
	}
	return map[string]any{
		"pct":       f(Pct),
		"pctSigned": f(PctSigned),
		"pp":        f(PP),
		"bp":        f(BP),
		"years":     f(Years),
		"convexity": f(Convexity),
		"money":     f(func(x float64) string { return Money(x, ccy) }),
		"num": func(v any, dec int) string {
			x, ok := toFloat(v)
			if !ok {
				return NA
			}
			return Num(x, dec)
		},
		"metric":      func(name string) string { return metricOf(name).label },
		"metricValue": func(name string, v any) string { return formatMetric(name, v, ccy, false) },
		"metricChange": func(name string, v any) string {
			return formatMetric(name, v, ccy, true)
		},
		"datetime": func(t time.Time) string { return t.UTC().Format("2006-01-02 15:04 UTC") },
		"upper":    strings.ToUpper,
		"wrap":     wrap,
		"paragraphs": func(s string) []string {
			ps := splitParagraphs(s)
			for i, p := range ps {
				ps[i] = strings.Join(strings.Fields(p), " ")
			}
			return ps
		},
		"pad":     func(n int, s string) string { return fmt.Sprintf("%-*s", n, s) },
		"padLeft": func(n int, s string) string { return fmt.Sprintf("%*s", n, s) },
		"status":  statusLabel,
		"kind":    humanize,
	}
}

func formatMetric(name string, v any, ccy string, change bool) string {
	x, ok := toFloat(v)
	if !ok {
		return NA
	}
	if change {
		return metricOf(name).change(x, ccy)
	}
	return metricOf(name).format(x, ccy)
}

func toFloat(v any) (float64, bool) {
	switch x := v.(type) {
	case float64:
		return x, true
	case *float64:
		if x == nil {
			return 0, false
		}
		return *x, true
	case int:
		return float64(x), true
	case int64:
		return float64(x), true
	}
	return 0, false
}

// texts executes the section and e-mail templates of one folder.
type texts struct {
	fsys  fs.FS
	data  TextData
	ccy   string
	cache map[string]*template.Template
}

func newTexts(fsys fs.FS, data TextData) *texts {
	return &texts{fsys: fsys, data: data, ccy: data.Doc.BaseCurrency, cache: map[string]*template.Template{}}
}

func (t *texts) load(file string) (*template.Template, error) {
	if tm, ok := t.cache[file]; ok {
		return tm, nil
	}
	b, err := fs.ReadFile(t.fsys, file)
	if err != nil {
		return nil, fmt.Errorf("report: texts: %w", err)
	}
	tm, err := template.New(file).Option("missingkey=error").Funcs(funcs(t.ccy)).Parse(string(b))
	if err != nil {
		return nil, fmt.Errorf("report: %w: %v", ErrTemplate, err)
	}
	t.cache[file] = tm
	return tm, nil
}

// get executes the template called name in file; a name the file does not
// define gives "". A file's body outside any define is its name "".
func (t *texts) get(file, name string) (string, error) {
	tm, err := t.load(file)
	if err != nil {
		return "", err
	}
	if name != "" {
		tm = tm.Lookup(name)
		if tm == nil {
			return "", nil
		}
	}
	var b bytes.Buffer
	if err := tm.Execute(&b, t.data); err != nil {
		return "", fmt.Errorf("report: %w: %v", ErrTemplate, err)
	}
	return strings.TrimSpace(b.String()), nil
}

// section returns a define of a section's file, <section>.tmpl.
func (t *texts) section(sec, name string) (string, error) {
	return t.get(sec+templateSuffix, name)
}

// html executes an html/template file.
func (t *texts) html(file string) (string, error) {
	b, err := fs.ReadFile(t.fsys, file)
	if err != nil {
		return "", fmt.Errorf("report: texts: %w", err)
	}
	tm, err := htmltemplate.New(file).Option("missingkey=error").Funcs(funcs(t.ccy)).Parse(string(b))
	if err != nil {
		return "", fmt.Errorf("report: %w: %v", ErrTemplate, err)
	}
	var out bytes.Buffer
	if err := tm.Execute(&out, t.data); err != nil {
		return "", fmt.Errorf("report: %w: %v", ErrTemplate, err)
	}
	return out.String(), nil
}

// CheckTexts parses every template of the texts folder fsys laid over the
// embedded defaults and reads its section list, so a broken override is
// found when the configuration is loaded rather than at the first pack.
func CheckTexts(fsys fs.FS) error {
	all := textsFS(fsys)
	if _, err := readSections(all); err != nil {
		return err
	}
	files, err := fs.Glob(templates.Report(), "*"+templateSuffix)
	if err != nil {
		return err
	}
	names := map[string]bool{}
	for _, f := range files {
		names[f] = true
	}
	if fsys != nil {
		more, err := fs.Glob(fsys, "*"+templateSuffix)
		if err != nil {
			return fmt.Errorf("report: texts: %w", err)
		}
		for _, f := range more {
			names[f] = true
		}
	}
	for _, f := range slices.Sorted(maps.Keys(names)) {
		b, err := fs.ReadFile(all, f)
		if err != nil {
			return fmt.Errorf("report: texts: %w", err)
		}
		var perr error
		if f == fileEmailHTML {
			_, perr = htmltemplate.New(f).Funcs(funcs("")).Parse(string(b))
		} else {
			_, perr = template.New(f).Funcs(funcs("")).Parse(string(b))
		}
		if perr != nil {
			return fmt.Errorf("report: %w: %v", ErrTemplate, perr)
		}
	}
	return nil
}
