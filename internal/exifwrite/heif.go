package exifwrite

import (
	"encoding/binary"
	"fmt"
)

// HEIFOptions selects between the layouts found in real files.
type HEIFOptions struct {
	// Idat stores the Exif item inside the meta box (iloc version 1,
	// construction_method 1) instead of in an mdat box addressed by file
	// offset (iloc version 0, construction_method 0, as most cameras do).
	Idat bool
	// ExifPrefix writes exif_tiff_header_offset = 6 followed by
	// "Exif\0\0" before the TIFF header, as many phones do; otherwise the
	// offset is 0 and the TIFF header follows it directly.
	ExifPrefix bool
}

// HEIF returns a HEIF file (ISO/IEC 23008-12) whose Exif item holds payload,
// laid out as HEIFWith(payload, HEIFOptions{}).
func HEIF(payload []byte) ([]byte, error) { return HEIFWith(payload, HEIFOptions{}) }

// HEIFWith returns ftyp ('heic', compatible 'mif1','heic') + meta (hdlr
// 'pict', pitm, iloc, iinf with an 'hvc1' primary item and an 'Exif' item,
// iref 'cdsc' from the Exif item to the image, iprp with a 16x16 ispe for the
// image) + mdat (unless opt.Idat). The Exif item body
// follows ISO/IEC 23008-12 Annex A.2.1: a 4-byte big-endian
// exif_tiff_header_offset, then the data.
//
// The primary item has no coded data, no iloc entry and no hvcC: the file
// exercises metadata parsers only and no decoder can show an image from it
// (libheif's heif-info lists its boxes but refuses to open the image).
func HEIFWith(payload []byte, opt HEIFOptions) ([]byte, error) {
	item := make([]byte, 4, 4+6+len(payload))
	if opt.ExifPrefix {
		binary.BigEndian.PutUint32(item, 6)
		item = append(item, exifID...)
	}
	item = append(item, payload...)
	if uint64(len(item)) > 0xFFFFFFF0 {
		return nil, fmt.Errorf("heif: payload too large: %w", ErrInvalid)
	}

	ftyp := box("ftyp", []byte("heic\x00\x00\x00\x00mif1heic"))
	hdlr := fullBox("hdlr", 0, 0, append(make([]byte, 4), append([]byte("pict"), make([]byte, 13)...)...))
	pitm := fullBox("pitm", 0, 0, []byte{0, 1})
	infe := func(id uint16, typ string) []byte {
		b := binary.BigEndian.AppendUint16(nil, id)
		b = append(b, 0, 0) // item_protection_index
		b = append(b, typ...)
		b = append(b, 0) // empty item_name
		return fullBox("infe", 2, 0, b)
	}
	iinfBody := append([]byte{0, 2}, infe(1, "hvc1")...)
	iinfBody = append(iinfBody, infe(2, "Exif")...)
	iinf := fullBox("iinf", 0, 0, iinfBody)
	iref := fullBox("iref", 0, 0, box("cdsc", []byte{0, 2, 0, 1, 0, 1}))
	// iprp: the image's spatial extent (ispe, ISO/IEC 23008-12 "Image spatial extents"),
	// which HEIF requires for every image item, associated with item 1.
	ispe := fullBox("ispe", 0, 0, []byte{0, 0, 0, 16, 0, 0, 0, 16})
	ipma := fullBox("ipma", 0, 0, []byte{0, 0, 0, 1, 0, 1, 1, 0x01})
	iprp := box("iprp", concat(box("ipco", ispe), ipma))

	iloc := func(offset uint32) []byte {
		var b []byte
		b = append(b, 0x44) // offset_size 4, length_size 4
		b = append(b, 0x00) // base_offset_size 0, index_size/reserved 0
		b = append(b, 0, 1) // item_count
		b = append(b, 0, 2) // item_ID 2 (the Exif item)
		if opt.Idat {
			b = append(b, 0, 1) // reserved(12) + construction_method 1 (idat)
		}
		b = append(b, 0, 0) // data_reference_index: this file
		b = append(b, 0, 1) // extent_count
		b = binary.BigEndian.AppendUint32(b, offset)
		b = binary.BigEndian.AppendUint32(b, uint32(len(item)))
		v := byte(0)
		if opt.Idat {
			v = 1
		}
		return fullBox("iloc", v, 0, b)
	}
	meta := func(off uint32) []byte {
		body := concat(hdlr, pitm, iloc(off), iinf, iref, iprp)
		if opt.Idat {
			body = append(body, box("idat", item)...)
		}
		return fullBox("meta", 0, 0, body)
	}
	if opt.Idat {
		return concat(ftyp, meta(0)), nil
	}
	// The mdat offset depends on the meta size, which does not depend on
	// the offset value (fixed 4-byte field): build once to measure.
	off := uint32(len(ftyp) + len(meta(0)) + 8)
	return concat(ftyp, meta(off), box("mdat", item)), nil
}

// box encodes an ISO BMFF box with a 32-bit size (ISO/IEC 14496-12 4.2).
func box(typ string, body []byte) []byte {
	b := binary.BigEndian.AppendUint32(nil, uint32(8+len(body)))
	b = append(b, typ...)
	return append(b, body...)
}

// fullBox encodes a FullBox: version (8 bits) and flags (24 bits) first.
func fullBox(typ string, version byte, flags uint32, body []byte) []byte {
	h := []byte{version, byte(flags >> 16), byte(flags >> 8), byte(flags)}
	return box(typ, append(h, body...))
}

func concat(parts ...[]byte) []byte {
	var out []byte
	for _, p := range parts {
		out = append(out, p...)
	}
	return out
}
