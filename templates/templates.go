// Package templates holds the texts Plumbline ships with: the wording of
// the PDF pack and of its e-mails, and (added by their owners) the default
// configuration and service files.
//
// Each concern embeds its own folder into its own variable, in its own
// file, so an override folder named in the configuration can replace
// single files of one concern and fall back to these for the rest.
package templates

import (
	"embed"
	"io/fs"
)

//go:embed report
var report embed.FS

// Report returns the default texts of the PDF pack and its e-mails, rooted
// at the folder report/: sections.txt (which sections appear, in order),
// one <section>.tmpl per section, footer.tmpl and the email_*.tmpl files.
// They are Go text/template files (email_html.tmpl is html/template).
func Report() fs.FS {
	sub, err := fs.Sub(report, "report")
	if err != nil {
		panic(err) // cannot happen: "report" is a valid embedded path
	}
	return sub
}
