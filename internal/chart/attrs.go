package chart

import (
	"bytes"
	"html"
	"regexp"
	"strings"
)

var styleAttr = regexp.MustCompile(`(\s)style="([^"]*)"`)

// presentationAttrs rewrites the SVG's style="k:v;..." attributes as SVG
// presentation attributes (k="v"). The pages' Content-Security-Policy
// refuses inline styles, which would otherwise strip the charts' colours,
// lines and fonts; presentation attributes are plain markup and allowed.
// Properties that are not presentation attributes are dropped.
func presentationAttrs(svg []byte) []byte {
	return styleAttr.ReplaceAllFunc(svg, func(m []byte) []byte {
		sub := styleAttr.FindSubmatch(m)
		decl := html.UnescapeString(string(sub[2]))
		var out bytes.Buffer
		for _, d := range strings.Split(decl, ";") {
			k, v, ok := strings.Cut(d, ":")
			k, v = strings.TrimSpace(k), strings.TrimSpace(v)
			if !ok || !presentation[k] {
				continue
			}
			out.Write(sub[1])
			out.WriteString(k + `="` + html.EscapeString(v) + `"`)
		}
		return out.Bytes()
	})
}

// presentation lists the SVG presentation attributes gonum's SVG canvas
// writes as style properties.
var presentation = map[string]bool{
	"fill": true, "fill-opacity": true, "fill-rule": true,
	"stroke": true, "stroke-width": true, "stroke-opacity": true, "stroke-dasharray": true,
	"stroke-dashoffset": true, "stroke-linecap": true, "stroke-linejoin": true, "stroke-miterlimit": true,
	"font-family": true, "font-size": true, "font-style": true, "font-variant": true, "font-weight": true,
	"opacity": true, "text-anchor": true, "dominant-baseline": true,
}
