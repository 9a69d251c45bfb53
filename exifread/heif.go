package exifread

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
)

// HEIF/AVIF (ISO/IEC 23008-12, on the ISO base media file format ISO/IEC
// 14496-12): the Exif block is an item of type 'Exif' listed in the meta
// box's item-info box (iinf/infe, 14496-12 §8.11.6) and located by the
// item-location box (iloc, §8.11.3). Its data starts with a 4-byte
// big-endian offset to the TIFF header (23008-12 Annex A.2.1). XMP is an
// item of type 'mime' with content type application/rdf+xml.

type box struct {
	typ       string
	off, size int64 // whole box
	body      int64 // start of payload
}

// nextBox reads the box header at off within [off, end).
func nextBox(b io.ReaderAt, off, end int64, where string) (box, error) {
	h, err := readAt(b, off, 8, end, where)
	if err != nil {
		return box{}, err
	}
	bx := box{typ: string(h[4:8]), off: off, size: int64(binary.BigEndian.Uint32(h)), body: off + 8}
	switch bx.size {
	case 1:
		l, err := readAt(b, off+8, 8, end, where)
		if err != nil {
			return box{}, err
		}
		u := binary.BigEndian.Uint64(l)
		if u > 1<<62 {
			return box{}, formatErr(where, off, "box %q size %d", bx.typ, u)
		}
		bx.size = int64(u)
		bx.body = off + 16
	case 0:
		bx.size = end - off
	}
	if bx.size < bx.body-off || bx.size > end-off {
		return box{}, formatErr(where, off, "box %q size %d does not fit in %d bytes", bx.typ, bx.size, end-off)
	}
	return bx, nil
}

type ilocExtent struct{ off, len int64 }

type ilocItem struct {
	method  int
	base    int64
	extents []ilocExtent
}

// walkHEIF finds the meta box among the top-level boxes, reads it into
// memory (bounded), and extracts the Exif and XMP items.
func walkHEIF(r io.ReaderAt, size int64, container string, opt Options) *found {
	f := &found{container: container}
	var meta box
	off := int64(0)
	for n := 0; off < size; n++ {
		if n >= opt.MaxSegments {
			f.problems = append(f.problems, &LimitError{Where: "heif", Limit: "MaxSegments", Value: int64(n), Max: int64(opt.MaxSegments)})
			return f
		}
		bx, err := nextBox(r, off, size, "heif")
		if err != nil {
			f.problems = append(f.problems, err)
			return f
		}
		if bx.typ == "meta" {
			meta = bx
			break
		}
		off += bx.size
	}
	if meta.typ == "" {
		f.problems = append(f.problems, formatErr("heif", -1, "no meta box"))
		return f
	}
	if meta.size > opt.MaxMetaBoxBytes {
		f.problems = append(f.problems, &LimitError{Where: "heif meta", Limit: "MaxMetaBoxBytes", Value: meta.size, Max: opt.MaxMetaBoxBytes})
		return f
	}
	mb, err := readAt(r, meta.off, meta.size, size, "heif meta")
	if err != nil {
		f.problems = append(f.problems, err)
		return f
	}
	mr := bytes.NewReader(mb)
	mend := int64(len(mb))
	// meta is a full box: 4 bytes version+flags after the header.
	first := meta.body - meta.off + 4
	var iinf, iloc, idat box
	for p, n := first, 0; p < mend; n++ {
		if n >= opt.MaxSegments {
			f.problems = append(f.problems, &LimitError{Where: "heif meta", Limit: "MaxSegments", Value: int64(n), Max: int64(opt.MaxSegments)})
			return f
		}
		bx, err := nextBox(mr, p, mend, "heif meta")
		if err != nil {
			f.problems = append(f.problems, offsetBy(err, meta.off))
			break
		}
		switch bx.typ {
		case "iinf":
			iinf = bx
		case "iloc":
			iloc = bx
		case "idat":
			idat = bx
		}
		p += bx.size
	}
	if iinf.typ == "" || iloc.typ == "" {
		f.problems = append(f.problems, formatErr("heif meta", meta.off, "no iinf or iloc box"))
		return f
	}
	exifIDs, xmpIDs, err := parseIINF(mb[iinf.body:iinf.off+iinf.size], opt)
	if err != nil {
		f.problems = append(f.problems, offsetBy(err, meta.off+iinf.off))
	}
	items, err := parseILOC(mb[iloc.body:iloc.off+iloc.size], opt)
	if err != nil {
		f.problems = append(f.problems, offsetBy(err, meta.off+iloc.off))
	}
	gather := func(id uint32, max int64, what string) ([]byte, bool) {
		it, ok := items[id]
		if !ok {
			f.problems = append(f.problems, formatErr("heif iloc", meta.off+iloc.off, "%s item %d has no location", what, id))
			return nil, false
		}
		var out []byte
		for _, e := range it.extents {
			if e.len > max-int64(len(out)) {
				f.problems = append(f.problems, &LimitError{Where: "heif " + what + " item", Limit: "MaxExifBytes", Value: int64(len(out)) + e.len, Max: max})
				return nil, false
			}
			var b []byte
			var err error
			switch it.method {
			case 0:
				b, err = readAt(r, it.base+e.off, e.len, size, "heif "+what+" item")
				if e.len == 0 { // length 0 means "to the end of the file"
					b, err = nil, &UnsupportedError{Where: "heif " + what + " item", Err: errors.New("extent of length 0")}
				}
			case 1:
				b, err = readAt(bytes.NewReader(mb[idat.body:idat.off+idat.size]), it.base+e.off, e.len, idat.off+idat.size-idat.body, "heif idat")
				if idat.typ == "" {
					err = formatErr("heif", -1, "%s item in idat but no idat box", what)
				}
			default:
				err = &UnsupportedError{Where: "heif " + what + " item", Err: errors.New("construction method 2 (from other items)")}
			}
			if err != nil {
				f.problems = append(f.problems, err)
				return nil, false
			}
			out = append(out, b...)
		}
		return out, true
	}
	if len(exifIDs) > 0 {
		if b, ok := gather(exifIDs[0], opt.MaxExifBytes, "Exif"); ok {
			if len(b) < 4 {
				f.problems = append(f.problems, formatErr("heif Exif item", -1, "item of %d bytes", len(b)))
			} else {
				skip := int64(binary.BigEndian.Uint32(b))
				if skip > int64(len(b))-4 {
					f.problems = append(f.problems, formatErr("heif Exif item", -1, "TIFF header offset %d beyond item of %d bytes", skip, len(b)))
				} else {
					f.setExif(b[4+skip:])
				}
			}
		}
	}
	if len(xmpIDs) > 0 {
		if b, ok := gather(xmpIDs[0], opt.MaxXMPBytes, "XMP"); ok {
			f.setXMP(b)
		}
	}
	return f
}

func offsetBy(err error, by int64) error {
	var fe *FormatError
	if errors.As(err, &fe) && fe.Offset >= 0 {
		fe.Offset += by
	}
	return err
}

// parseIINF returns the IDs of Exif items and of XMP (mime rdf+xml) items.
func parseIINF(b []byte, opt Options) (exif, xmp []uint32, err error) {
	if len(b) < 6 {
		return nil, nil, formatErr("heif iinf", 0, "box too short")
	}
	p := 4
	var count int64
	if b[0] == 0 {
		count = int64(binary.BigEndian.Uint16(b[p:]))
		p += 2
	} else {
		if len(b) < 8 {
			return nil, nil, formatErr("heif iinf", 0, "box too short")
		}
		count = int64(binary.BigEndian.Uint32(b[p:]))
		p += 4
	}
	if count > int64(opt.MaxSegments) {
		return nil, nil, &LimitError{Where: "heif iinf", Limit: "MaxSegments", Value: count, Max: int64(opt.MaxSegments)}
	}
	r := bytes.NewReader(b)
	for i := int64(0); i < count && p < len(b); i++ {
		bx, err := nextBox(r, int64(p), int64(len(b)), "heif iinf")
		if err != nil {
			return exif, xmp, err
		}
		p += int(bx.size)
		if bx.typ != "infe" {
			continue
		}
		body := b[bx.body : bx.off+bx.size]
		if len(body) < 4 {
			continue
		}
		ver := body[0]
		q := body[4:]
		if ver < 2 {
			continue // versions 0/1 carry no item type
		}
		var id uint32
		if ver == 2 {
			if len(q) < 8 {
				continue
			}
			id = uint32(binary.BigEndian.Uint16(q))
			q = q[4:]
		} else {
			if len(q) < 10 {
				continue
			}
			id = binary.BigEndian.Uint32(q)
			q = q[6:]
		}
		typ := string(q[:4])
		q = q[4:]
		switch typ {
		case "Exif":
			exif = append(exif, id)
		case "mime":
			// item_name\0 content_type\0
			if j := bytes.IndexByte(q, 0); j >= 0 {
				ct := q[j+1:]
				if k := bytes.IndexByte(ct, 0); k >= 0 {
					ct = ct[:k]
				}
				if string(ct) == "application/rdf+xml" {
					xmp = append(xmp, id)
				}
			}
		}
	}
	return exif, xmp, nil
}

// parseILOC decodes the item-location box (ISO/IEC 14496-12 §8.11.3.2).
func parseILOC(b []byte, opt Options) (map[uint32]ilocItem, error) {
	items := map[uint32]ilocItem{}
	p := 0
	need := func(n int) error {
		if n < 0 || p+n > len(b) {
			return formatErr("heif iloc", int64(p), "box too short")
		}
		return nil
	}
	uint := func(n int) (int64, error) {
		if err := need(n); err != nil {
			return 0, err
		}
		var v uint64
		for i := 0; i < n; i++ {
			v = v<<8 | uint64(b[p+i])
		}
		p += n
		if v > 1<<62 {
			return 0, formatErr("heif iloc", int64(p), "value %d too large", v)
		}
		return int64(v), nil
	}
	if err := need(6); err != nil {
		return nil, err
	}
	ver := b[0]
	p = 4
	offSize, lenSize := int(b[p]>>4), int(b[p]&15)
	baseSize, idxSize := int(b[p+1]>>4), int(b[p+1]&15)
	p += 2
	if ver != 1 && ver != 2 {
		idxSize = 0
	}
	for _, s := range []int{offSize, lenSize, baseSize, idxSize} {
		if s != 0 && s != 4 && s != 8 {
			return nil, formatErr("heif iloc", 4, "field size %d not 0, 4 or 8", s)
		}
	}
	var count int64
	var err error
	if ver < 2 {
		count, err = uint(2)
	} else {
		count, err = uint(4)
	}
	if err != nil {
		return nil, err
	}
	if count > int64(opt.MaxSegments) {
		return nil, &LimitError{Where: "heif iloc", Limit: "MaxSegments", Value: count, Max: int64(opt.MaxSegments)}
	}
	for i := int64(0); i < count; i++ {
		var id int64
		if ver < 2 {
			id, err = uint(2)
		} else {
			id, err = uint(4)
		}
		if err != nil {
			return items, err
		}
		var it ilocItem
		if ver == 1 || ver == 2 {
			m, err := uint(2)
			if err != nil {
				return items, err
			}
			it.method = int(m & 15)
		}
		if _, err := uint(2); err != nil { // data_reference_index
			return items, err
		}
		if it.base, err = uint(baseSize); err != nil {
			return items, err
		}
		ne, err := uint(2)
		if err != nil {
			return items, err
		}
		for j := int64(0); j < ne; j++ {
			if _, err := uint(idxSize); err != nil {
				return items, err
			}
			var e ilocExtent
			if e.off, err = uint(offSize); err != nil {
				return items, err
			}
			if e.len, err = uint(lenSize); err != nil {
				return items, err
			}
			it.extents = append(it.extents, e)
		}
		if _, dup := items[uint32(id)]; !dup {
			items[uint32(id)] = it
		}
	}
	return items, nil
}
