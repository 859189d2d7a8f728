package dataset

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"io"
	"path"
	"strings"
)

// formulaCells lists the cells of the named sheet that hold a formula
// without a saved value (a workbook written by a program that does not
// compute formulas): the reader sees them as empty. It returns nil when the
// workbook cannot be inspected.
func formulaCells(data []byte, sheet string) []string {
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return nil
	}
	open := func(name string) []byte {
		for _, f := range zr.File {
			if strings.EqualFold(f.Name, name) {
				rc, err := f.Open()
				if err != nil {
					return nil
				}
				defer rc.Close()
				b, _ := io.ReadAll(io.LimitReader(rc, 1<<30))
				return b
			}
		}
		return nil
	}
	var wb struct {
		Sheets []struct {
			Name string `xml:"name,attr"`
			RID  string `xml:"http://schemas.openxmlformats.org/officeDocument/2006/relationships id,attr"`
		} `xml:"sheets>sheet"`
	}
	if xml.Unmarshal(open("xl/workbook.xml"), &wb) != nil {
		return nil
	}
	var rels struct {
		Rels []struct {
			ID     string `xml:"Id,attr"`
			Target string `xml:"Target,attr"`
		} `xml:"Relationship"`
	}
	if xml.Unmarshal(open("xl/_rels/workbook.xml.rels"), &rels) != nil {
		return nil
	}
	target := ""
	for _, s := range wb.Sheets {
		if s.Name != sheet {
			continue
		}
		for _, r := range rels.Rels {
			if r.ID == s.RID {
				target = r.Target
			}
		}
	}
	if target == "" {
		return nil
	}
	if strings.HasPrefix(target, "/") {
		target = strings.TrimPrefix(target, "/")
	} else {
		target = path.Join("xl", target)
	}
	dec := xml.NewDecoder(bytes.NewReader(open(target)))
	var out []string
	ref, inC, hasF, hasV := "", false, false, false
	for {
		tok, err := dec.Token()
		if err != nil {
			return out
		}
		switch e := tok.(type) {
		case xml.StartElement:
			switch e.Name.Local {
			case "c":
				inC, hasF, hasV, ref = true, false, false, ""
				for _, a := range e.Attr {
					if a.Name.Local == "r" {
						ref = a.Value
					}
				}
			case "f":
				hasF = hasF || inC
			case "v", "is":
				hasV = hasV || inC
			}
		case xml.EndElement:
			if e.Name.Local == "c" {
				if hasF && !hasV {
					out = append(out, ref)
				}
				inC = false
			}
		}
	}
}
