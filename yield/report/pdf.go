package report

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"runtime"
	"strings"
	"sync"
	"time"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot/vg"
)

// ErrPaper is returned for a paper size other than a4 or letter.
var ErrPaper = errors.New("report: paper must be a4 or letter")

// defaultDate stamps a document that was given no survey date, so that reruns stay
// byte-identical.
var defaultDate = time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)

// page geometry and type sizes, millimetres and points.
const (
	margin   = 18.0
	bodyPt   = 10.0
	smallPt  = 8.0
	h1Pt     = 22.0
	h2Pt     = 15.0
	lineMM   = 5.0
	fontName = "Sans"
)

// pdfDoc wraps fpdf with the documents' type hierarchy. Every text goes through cell,
// multi or split (pdftext.go), which draw any script.
type pdfDoc struct {
	*fpdf.Fpdf
	w, h  float64         // page, mm
	faces map[string]bool // fallback fonts registered so far, by family and style
}

func rgb(c interface{ RGBA() (r, g, b, a uint32) }) (int, int, int) {
	r, g, b, _ := c.RGBA()
	return int(r >> 8), int(g >> 8), int(b >> 8)
}

func (d *pdfDoc) colour(c interface{ RGBA() (r, g, b, a uint32) }) {
	d.SetTextColor(rgb(c))
}

func (d *pdfDoc) contentW() float64 { return d.w - 2*margin }

// heading starts a page with its title (the titles are what the tests look for).
func (d *pdfDoc) heading(title, lead string) {
	d.AddPage()
	d.section(title, lead)
}

// section starts a titled part on the current page.
func (d *pdfDoc) section(title, lead string) {
	d.SetFont(fontName, "B", h2Pt)
	d.colour(Accent)
	d.cell(0, 9, title, "", 1, "L", false)
	d.SetDrawColor(rgb(Accent))
	d.SetLineWidth(0.6)
	y := d.GetY()
	d.Line(margin, y, margin+24, y)
	d.Ln(3)
	if lead != "" {
		d.para(lead)
		d.Ln(1)
	}
}

func (d *pdfDoc) para(s string) {
	d.SetFont(fontName, "", bodyPt)
	d.colour(Ink)
	d.multi(lineMM, s, false)
}

func (d *pdfDoc) small(s string) {
	d.SetFont(fontName, "", smallPt)
	d.colour(Ink)
	d.multi(4, s, false)
}

func (d *pdfDoc) sub(s string) {
	// A heading never ends a page: it goes with what follows.
	if d.GetY() > d.h-margin-30 {
		d.AddPage()
	}
	d.Ln(2)
	d.SetFont(fontName, "B", 11)
	d.colour(Ink)
	d.cell(0, 7, s, "", 1, "L", false)
}

func (d *pdfDoc) bullets(items []string) {
	for _, it := range items {
		d.SetFont(fontName, "", bodyPt)
		d.colour(Accent)
		d.cell(5, lineMM, "•", "", 0, "L", false)
		d.colour(Ink)
		d.multi(lineMM, it, false)
		d.Ln(0.8)
	}
}

// table draws a header row and rows; widths are fractions of the content width; align per
// column ("L" or "R"). A row whose first cell starts with tableHead is printed bold on a
// tinted band: a heading inside the table.
func (d *pdfDoc) table(head []string, rows [][]string, widths []float64, align string) {
	cw := d.contentW()
	d.SetFont(fontName, "B", smallPt+0.5)
	d.colour(Ink)
	d.SetFillColor(rgb(faceFill))
	for i, h := range head {
		d.cell(widths[i]*cw, 6, h, "B", 0, string(align[i]), true)
	}
	d.Ln(-1)
	d.SetDrawColor(rgb(Muted))
	d.SetLineWidth(0.2)
	for _, r := range rows {
		band := len(r) > 0 && strings.HasPrefix(r[0], tableHead)
		if band {
			d.SetFont(fontName, "B", smallPt+0.5)
		} else {
			d.SetFont(fontName, "", smallPt+0.5)
		}
		// A cell too long for its column wraps; the row is as tall as its tallest cell.
		cells := make([][]string, len(r))
		n := 1
		for i, c := range r {
			if i == 0 {
				c = strings.TrimPrefix(c, tableHead)
			}
			cells[i] = d.split(c, widths[i]*cw-2)
			if len(cells[i]) == 0 {
				cells[i] = []string{""}
			}
			n = max(n, len(cells[i]))
		}
		const lineH = 4.2
		rowH := math.Max(5.5, float64(n)*lineH+1.3)
		if d.GetY()+rowH > d.h-margin-8 {
			d.AddPage()
		}
		x0, y0 := d.GetX(), d.GetY()
		x := x0
		for i, ls := range cells {
			w := widths[i] * cw
			if band {
				d.Rect(x, y0, w, rowH, "F")
			}
			for k, l := range ls {
				d.SetXY(x, y0+0.65+float64(k)*lineH)
				d.cell(w, lineH, l, "", 0, string(align[i]), false)
			}
			x += w
		}
		d.Line(x0, y0+rowH, x, y0+rowH)
		d.SetXY(x0, y0+rowH)
	}
	d.Ln(2)
}

// tableHead marks a heading row of a table.
const tableHead = "\x00"

// image places a PNG across wFrac of the content width, keeping its proportions.
func (d *pdfDoc) image(name string, png []byte, wFrac float64) { d.imageAbove(name, png, wFrac, 0) }

// paraHeight is the height (mm) para gives s on a full line width.
func (d *pdfDoc) paraHeight(s string) float64 {
	d.SetFont(fontName, "", bodyPt)
	return float64(len(d.split(s, d.contentW()))) * lineMM
}

// imageAbove is image for a picture that text of height below (mm) follows on its page: a
// picture that fits but would push the last lines of that text onto a page of their own is
// shrunk, by at most a quarter, so that the text fits under it.
func (d *pdfDoc) imageAbove(name string, png []byte, wFrac, below float64) {
	opt := fpdf.ImageOptions{ImageType: "PNG"}
	info := d.RegisterImageOptionsReader(name, opt, bytes.NewReader(png))
	if info == nil {
		return
	}
	w := d.contentW() * wFrac
	h := w * info.Height() / info.Width()
	// A picture that nearly fits the rest of the page is shrunk rather than pushed to a page
	// of its own (two plan drawings share a Letter page this way).
	if avail := d.h - margin - 8 - d.GetY(); h > avail {
		if avail >= 0.75*h {
			w, h = w*avail/h, avail
		} else {
			d.AddPage()
		}
	} else if room := avail - imageGap - below; below > 0 && h > room && room >= 0.75*h {
		w, h = w*room/h, room
	}
	d.ImageOptions(name, margin+(d.contentW()-w)/2, d.GetY(), w, h, false, opt, 0, "")
	d.SetY(d.GetY() + h + imageGap)
}

// imageGap is the space under a picture, mm.
const imageGap = 3

// Cover is what the proposal's first page and footer say about whom it is for and who
// made it; every field is optional. Dates are YYYY-MM-DD.
type Cover struct {
	Customer   string
	Address    string
	PreparedBy string
	Date       string // the survey's date
	ValidUntil string
}

// lines returns the cover's two lines: for whom, and by whom and when.
func (c Cover) lines() (who, when string) {
	var a, b []string
	if c.Customer != "" {
		a = append(a, "for "+c.Customer)
	}
	if c.Address != "" {
		a = append(a, c.Address)
	}
	by := ""
	if c.PreparedBy != "" {
		by = "prepared by " + c.PreparedBy
	}
	if c.Date != "" {
		by = strings.TrimSpace(by + " on " + c.Date)
	}
	if by != "" {
		b = append(b, by)
	}
	if c.ValidUntil != "" {
		b = append(b, "valid until "+c.ValidUntil)
	}
	return strings.Join(a, ", "), strings.Join(b, ", ")
}

// date is the documents' metadata date: the proposal's Date, else the cover's date, else
// defaultDate.
func (pr *Proposal) date() time.Time {
	if !pr.Date.IsZero() {
		return pr.Date.UTC()
	}
	if t, err := time.Parse(time.DateOnly, pr.Cover.Date); err == nil {
		return t
	}
	return defaultDate
}

// newDoc starts a document of the proposal's paper with its metadata and footer.
func (pr *Proposal) newDoc(title string) (*pdfDoc, error) {
	size := "A4"
	switch strings.ToLower(pr.Paper) {
	case "", "a4":
	case "letter":
		size = "Letter"
	default:
		return nil, fmt.Errorf("%w, not %q", ErrPaper, pr.Paper)
	}
	s := pr.Summary
	f := fpdf.New("P", "mm", size, "")
	w, h := f.GetPageSize()
	d := &pdfDoc{Fpdf: f, w: w, h: h}
	date := pr.date()
	f.SetCreationDate(date)
	f.SetModificationDate(date)
	f.SetCatalogSort(true)
	f.SetCompression(true)
	f.SetMargins(margin, margin, margin)
	f.SetAutoPageBreak(true, margin+6)
	f.AddUTF8FontFromBytes(fontName, "", liberationsansregular.TTF)
	f.AddUTF8FontFromBytes(fontName, "B", liberationsansbold.TTF)
	f.SetTitle(bmp(title+": "+s.Site.Name), true)
	if pr.Cover.PreparedBy != "" {
		f.SetAuthor(bmp(pr.Cover.PreparedBy), true)
	}
	f.SetCreator("sunstring", true)
	f.SetProducer("sunstring", true)
	f.AliasNbPages("{nb}")
	who, when := pr.Cover.lines()
	first := s.Site.Name
	if who != "" {
		first += " · " + who
	}
	second := "an estimate, not a design"
	if when != "" {
		second = when + " · " + second
	}
	f.SetFooterFunc(func() {
		f.SetY(-margin + 1)
		f.SetFont(fontName, "", 7.5)
		f.SetTextColor(0x6b, 0x73, 0x78)
		page := fmt.Sprintf("%s · page %d of {nb}", title, f.PageNo())
		// The page label goes beside the line it fits beside, else under both.
		room := d.contentW() - f.GetStringWidth(page+"   ")
		d.cell(0, 3.5, first, "", 0, "L", false)
		if d.width(first) <= room {
			d.cell(0, 3.5, page, "", 1, "R", false)
			page = ""
		} else {
			f.Ln(3.5)
		}
		d.cell(0, 3.5, second, "", 0, "L", false)
		if page != "" && d.width(second) <= room {
			d.cell(0, 3.5, page, "", 0, "R", false)
		} else if page != "" {
			f.Ln(3.5)
			d.cell(0, 3.5, page, "", 0, "R", false)
		}
	})
	return d, nil
}

// finish returns the document's bytes.
func (d *pdfDoc) finish() ([]byte, error) {
	if err := d.Error(); err != nil {
		return nil, fmt.Errorf("report: pdf: %w", err)
	}
	var buf bytes.Buffer
	if err := d.Output(&buf); err != nil {
		return nil, fmt.Errorf("report: pdf: %w", err)
	}
	return buf.Bytes(), nil
}

// renderCharts draws the proposal's charts for the documents, by name, once for both of them.
func (pr *Proposal) renderCharts() (map[string][]byte, error) {
	if pr.pdfCharts != nil {
		return pr.pdfCharts, nil
	}
	cs := pr.Charts()
	// fpdf's catalog sort orders images by pixel width alone, and takes them from a map:
	// charts of equal width would land in a random order and the bytes would differ from
	// run to run. One pixel more per chart (invisible once placed) makes the order fixed.
	px := vg.Inch / chartDPI
	bs, err := RenderEach(len(cs), func(k int) ([]byte, error) {
		return Render(cs[k].Plot, cs[k].W+vg.Length(k)*px, cs[k].H, PNG)
	})
	if err != nil {
		return nil, err
	}
	charts := make(map[string][]byte, len(cs))
	for k, c := range cs {
		charts[c.Name] = bs[k]
	}
	pr.pdfCharts = charts
	return charts, nil
}

// RenderEach calls render for 0..n-1 on all cores and returns the results in order, or the
// first error by index. Charts are independent, and drawing them is most of a report's time.
func RenderEach(n int, render func(i int) ([]byte, error)) ([][]byte, error) {
	out := make([][]byte, n)
	errs := make([]error, n)
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for i := range n {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer func() { <-sem; wg.Done() }()
			out[i], errs[i] = render(i)
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}

// cover prints the document's first lines: the kind of document, the site's name and the
// cover's lines.
func (pr *Proposal) cover(d *pdfDoc, kind string) {
	s := pr.Summary
	d.AddPage()
	d.SetFont(fontName, "", 9)
	d.colour(Accent)
	d.cell(0, 5, kind, "", 1, "L", false)
	d.SetFont(fontName, "B", h1Pt)
	d.colour(Ink)
	d.multi(10, s.Site.Name, false)
	who, when := pr.Cover.lines()
	d.SetFont(fontName, "", bodyPt)
	for _, l := range []string{who, when} {
		if l != "" {
			d.multi(lineMM, strings.ToUpper(l[:1])+l[1:], false)
		}
	}
	d.Ln(2)
	if s.Climate.Source == "indicative" {
		d.SetFillColor(rgb(Warn))
		d.SetTextColor(255, 255, 255)
		d.SetFont(fontName, "B", 12)
		d.cell(0, 8, "  INDICATIVE ONLY — NO CLIMATE DATA", "", 1, "L", true)
		d.SetFont(fontName, "", bodyPt)
		d.multi(lineMM, "This estimate uses a clear-sky year without clouds because no weather file or monthly values were given. Real yields are lower, often by a fifth or more. Do not base a purchase on these figures; ask for a survey with climate data.", true)
		d.Ln(4)
	}
}

// figure is one key figure box.
type figure struct{ label, value, unit string }

// figures draws boxes across the page.
func (d *pdfDoc) figures(figs []figure) {
	cw := d.contentW()
	n := float64(len(figs))
	bw := (cw - (n-1)*4) / n
	y := d.GetY()
	for i, f := range figs {
		x := margin + float64(i)*(bw+4)
		d.SetFillColor(rgb(faceFill))
		d.Rect(x, y, bw, 24, "F")
		d.SetFillColor(rgb(Accent))
		d.Rect(x, y, 1.2, 24, "F")
		d.SetXY(x+4, y+2.5)
		d.SetFont(fontName, "", smallPt)
		d.colour(Ink)
		d.cell(bw-6, 4, f.label, "", 2, "L", false)
		d.SetX(x + 4)
		d.SetFont(fontName, "B", 17)
		d.colour(Accent)
		d.cell(bw-6, 9, f.value, "", 2, "L", false)
		d.SetX(x + 4)
		d.SetFont(fontName, "", smallPt)
		d.colour(Ink)
		d.cell(bw-6, 4, f.unit, "", 2, "L", false)
	}
	d.SetXY(margin, y+27)
}

// keyValues prints label–text rows.
func (d *pdfDoc) keyValues(rows [][2]string) {
	for _, r := range rows {
		d.SetFont(fontName, "B", 9)
		d.colour(Ink)
		yy := d.GetY()
		d.cell(34, lineMM, r[0], "", 0, "L", false)
		d.SetFont(fontName, "", 9)
		d.multi(lineMM, r[1], false)
		if d.GetY() < yy+lineMM {
			d.SetY(yy + lineMM)
		}
		d.Ln(1)
	}
}
