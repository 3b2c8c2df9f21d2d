package reports

import (
	"bytes"
	"compress/zlib"
	"fmt"
	"regexp"
	"runtime"
	"sort"
	"strconv"
	"sync"
	"sync/atomic"
)

// deflatePages compresses the page content streams of a PDF that gofpdf
// wrote uncompressed, with one zlib writer reused for every page. gofpdf
// compresses each page with a writer of its own, and allocating and
// clearing that writer's tables costs more than the compression; done
// here, at the same level (zlib.BestSpeed, gofpdf's), the bytes come out
// exactly as gofpdf's own compression gives them (TestDeflatePagesAsGofpdf).
//
// It relies on the layout gofpdf writes (ISO 32000-1, 7.5): an object per
// offset of the cross-reference table, a page's contents as
// "N 0 obj\n<</Length L>>\nstream\n…\nendstream\nendobj\n", the table and
// trailer at the end. When anything differs it reports false and the
// caller keeps the document as it is: valid, only larger.
//
// alias[0], when not empty, is replaced by alias[1] in every page stream
// before it is compressed, as gofpdf's own alias replacement does (the
// page total).
func deflatePages(doc []byte, alias [2][]byte) ([]byte, bool) {
	// cross-reference table
	sx := bytes.LastIndex(doc, []byte("startxref\n"))
	if sx < 0 {
		return nil, false
	}
	xo, err := strconv.Atoi(string(bytes.TrimSpace(bytes.TrimSuffix(bytes.TrimSpace(doc[sx+len("startxref\n"):]), []byte("%%EOF")))))
	if err != nil || xo <= 0 || xo >= sx {
		return nil, false
	}
	xref := doc[xo:sx]
	var count int
	if _, err := fmt.Sscanf(string(xref), "xref\n0 %d\n", &count); err != nil || count < 2 {
		return nil, false
	}
	head := len(fmt.Sprintf("xref\n0 %d\n", count))
	const entry = 20 // "0000012345 00000 n \n"
	if len(xref) < head+count*entry {
		return nil, false
	}
	trailer := xref[head+count*entry:]
	if !bytes.HasPrefix(trailer, []byte("trailer\n")) {
		return nil, false
	}
	offs := make([]int, count)
	for j := 1; j < count; j++ {
		e := xref[head+j*entry : head+(j+1)*entry]
		o, err := strconv.Atoi(string(e[:10]))
		if err != nil || string(e[10:]) != " 00000 n \n" || o <= 0 || o >= xo {
			return nil, false
		}
		offs[j] = o
	}
	// which objects are page contents
	contents := map[int]bool{}
	for _, m := range contentsRef.FindAllSubmatch(doc[:xo], -1) {
		n, _ := strconv.Atoi(string(m[1]))
		contents[n] = true
	}
	order := make([]int, 0, count-1)
	for j := 1; j < count; j++ {
		order = append(order, j)
	}
	sort.Slice(order, func(a, b int) bool { return offs[order[a]] < offs[order[b]] })

	// check every segment first, then compress the page streams on
	// parallel workers, each with its own writer: a stream's bytes depend
	// only on its data, so the document is the same whatever their number
	type part struct {
		seg  []byte // written as it is, or
		data []byte // a page's stream, compressed into z
		z    []byte
	}
	parts := make([]part, len(order))
	var pages []int
	for k, j := range order {
		end := xo
		if k+1 < len(order) {
			end = offs[order[k+1]]
		}
		seg := doc[offs[j]:end]
		if !contents[j] {
			parts[k].seg = seg
			continue
		}
		pre := fmt.Sprintf("%d 0 obj\n<</Length ", j)
		if !bytes.HasPrefix(seg, []byte(pre)) {
			return nil, false
		}
		rest := seg[len(pre):]
		i := bytes.Index(rest, []byte(">>\nstream\n"))
		if i < 0 {
			return nil, false
		}
		l, err := strconv.Atoi(string(rest[:i]))
		data := rest[i+len(">>\nstream\n"):]
		if err != nil || len(data) != l+len("\nendstream\nendobj\n") || string(data[l:]) != "\nendstream\nendobj\n" {
			return nil, false
		}
		parts[k].data = data[:l]
		pages = append(pages, k)
	}
	workers := min(runtime.GOMAXPROCS(0), len(pages))
	var next atomic.Int64
	var wg sync.WaitGroup
	var fault atomic.Pointer[struct{ v any }]
	for range workers {
		wg.Go(func() {
			defer func() {
				if r := recover(); r != nil {
					fault.CompareAndSwap(nil, &struct{ v any }{r})
					next.Store(int64(len(pages))) // the others stop
				}
			}()
			zw := zlibWriters.Get().(*zlib.Writer)
			defer zlibWriters.Put(zw)
			for {
				n := int(next.Add(1) - 1)
				if n >= len(pages) {
					return
				}
				pt := &parts[pages[n]]
				z := bytes.NewBuffer(make([]byte, 0, len(pt.data)/3+64))
				zw.Reset(z)
				// the alias replaced on the way in (deflate's output does
				// not depend on how its input is cut into writes)
				data := pt.data
				for len(alias[0]) > 0 {
					i := bytes.Index(data, alias[0])
					if i < 0 {
						break
					}
					zw.Write(data[:i])
					zw.Write(alias[1])
					data = data[i+len(alias[0]):]
				}
				zw.Write(data)
				zw.Close()
				pt.z = z.Bytes()
			}
		})
	}
	wg.Wait()
	if p := fault.Load(); p != nil {
		panic(p.v) // on the caller's goroutine: the command's recover makes it exit 3
	}

	size := offs[order[0]] + len(doc) - xo
	for _, pt := range parts {
		size += len(pt.seg) + len(pt.z) + 64
	}
	out := bytes.NewBuffer(make([]byte, 0, size))
	out.Write(doc[:offs[order[0]]])
	newOffs := make([]int, count)
	for k, j := range order {
		newOffs[j] = out.Len()
		if pt := parts[k]; pt.data == nil {
			out.Write(pt.seg)
		} else {
			fmt.Fprintf(out, "%d 0 obj\n<</Filter /FlateDecode /Length %d>>\nstream\n", j, len(pt.z))
			out.Write(pt.z)
			out.WriteString("\nendstream\nendobj\n")
		}
	}
	nx := out.Len()
	fmt.Fprintf(out, "xref\n0 %d\n0000000000 65535 f \n", count)
	for j := 1; j < count; j++ {
		fmt.Fprintf(out, "%010d 00000 n \n", newOffs[j])
	}
	out.Write(trailer)
	fmt.Fprintf(out, "startxref\n%d\n%%%%EOF\n", nx)
	return out.Bytes(), true
}

var contentsRef = regexp.MustCompile(`/Contents (\d+) 0 R`)

// zlibWriters keeps page compressors between documents: a new one
// allocates and clears about a megabyte of tables; Reset starts it afresh,
// so its output is the same.
var zlibWriters = sync.Pool{New: func() any {
	zw, _ := zlib.NewWriterLevel(nil, zlib.BestSpeed)
	return zw
}}
