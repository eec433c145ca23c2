// Package report renders a stored pack run into the PDF the investment
// committee reads, and into the e-mail that goes out with it.
//
// Render reads nothing but the results document (risk/pack.Document), the
// run record (Meta) and the options; every date in the file comes from
// Meta.CreatedAt, so rendering the same run twice gives the same bytes.
// Charts are drawn with gonum plot and embedded as PNG images.
//
// The wording, the footer and which sections appear in what order come
// from text templates: the embedded defaults of templates/report, which
// an override folder (Options.Texts) can replace file by file.
//
// Figures are printed with the exported formatting functions (Pct, Money,
// Years, ...); a figure absent from the document prints as "n/a", never
// as zero.
package report
