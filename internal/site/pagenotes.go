package site

import (
	"cmp"
	"html/template"
	"sync"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/models"
	"github.com/millrace-workshop/specgen/internal/render"
)

// The standard caution boxes, the same on every page that holds one.
var (
	standardBox = sync.OnceValue(func() template.HTML {
		return template.HTML(render.StandardCautionHTML(models.StandardCaution))
	})
	standardVacuumBox = sync.OnceValue(func() template.HTML {
		return template.HTML(render.StandardCautionHTML(models.StandardVacuumCaution))
	})
)

// standardCaution is the standard caution of a page: the full box on a page
// that holds a calculation of a kind that involves pressure, where its
// figures are worked out; a one-line strip, linked to the site's safety
// page, on a page that only quotes or charts one, so that the box keeps
// its weight where it stands; else nothing.
func (s *Site) standardCaution(p *Page) template.HTML {
	held := make([]string, len(p.blocks))
	for i, b := range p.blocks {
		held[i] = b.ID
	}
	if holds, vacuum := s.pressureCalcs(held); holds {
		if vacuum {
			return standardVacuumBox()
		}
		return standardBox()
	}
	shows, vacuum := s.pressureCalcs(s.blocksShown(p))
	if !shows {
		return ""
	}
	safety := ""
	for _, q := range s.listingPages {
		if q != p {
			safety = relativeURL(p.Out, q.Out)
			break
		}
	}
	if vacuum {
		return template.HTML(render.CautionStripHTML(models.StandardVacuumCautionStrip, safety))
	}
	return template.HTML(render.CautionStripHTML(models.StandardCautionStrip, safety))
}

// pageAlert lists under a page's title the failed claims and the
// unacknowledged DANGER cautions of the blocks it shows.
func (s *Site) pageAlert(p *Page) template.HTML {
	var problems []render.PageProblem
	for _, id := range s.blocksShown(p) {
		e, ok := s.Calc.Lookup(id)
		if !ok {
			continue
		}
		title := cmp.Or(e.Block.Title, id)
		href := s.blockLink(p, id)
		for _, c := range e.Claims {
			if !c.OK {
				problems = append(problems, render.PageProblem{Claim: true, Name: c.Claim.Result, BlockTitle: title, Href: href})
			}
		}
		for _, c := range e.Cautions {
			if c.Level >= calc.Danger && c.Acknowledged == "" {
				problems = append(problems, render.PageProblem{Name: c.Rule, BlockTitle: title, Href: href})
			}
		}
	}
	return template.HTML(render.PageAlertHTML(problems))
}
