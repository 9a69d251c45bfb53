package exifwrite

import (
	"encoding/binary"
	"fmt"
)

// WebP returns a RIFF/WEBP file (extended format, RFC 9649 section 2.7) of
// width x height pixels: a VP8X chunk with the EXIF flag, a solid-colour
// lossless VP8L image chunk, then an EXIF chunk holding payload (the TIFF
// payload itself, without the JPEG "Exif\0\0" identifier; the EXIF chunk
// follows the image data, as the extended format of section 2.7 orders). A nil payload writes no EXIF chunk and clears the flag.
func WebP(payload []byte, width, height int) ([]byte, error) {
	if width < 1 || height < 1 || width > 1<<14 || height > 1<<14 {
		return nil, fmt.Errorf("webp: size %dx%d outside 1..16384 (VP8L limit): %w", width, height, ErrInvalid)
	}
	vp8x := make([]byte, 10)
	if payload != nil {
		vp8x[0] = 0x08 // EXIF metadata flag ("E" bit)
	}
	put24(vp8x[4:], uint32(width-1))
	put24(vp8x[7:], uint32(height-1))

	body := []byte("WEBP")
	body = append(body, riffChunk("VP8X", vp8x)...)
	body = append(body, riffChunk("VP8L", SolidVP8L(width, height, 0x80, 0x90, 0xA0))...)
	if payload != nil {
		body = append(body, riffChunk("EXIF", payload)...)
	}
	if uint64(len(body)) > 0xFFFFFFFE {
		return nil, fmt.Errorf("webp: file too large for RIFF: %w", ErrInvalid)
	}
	out := []byte("RIFF")
	out = binary.LittleEndian.AppendUint32(out, uint32(len(body)))
	return append(out, body...), nil
}

func put24(b []byte, v uint32) { b[0], b[1], b[2] = byte(v), byte(v>>8), byte(v>>16) }

// riffChunk encodes a RIFF chunk: FourCC, little-endian size, data and a pad
// byte when the size is odd (RIFF chunks start at even offsets).
func riffChunk(fourCC string, data []byte) []byte {
	c := append([]byte(fourCC), 0, 0, 0, 0)
	binary.LittleEndian.PutUint32(c[4:], uint32(len(data)))
	c = append(c, data...)
	if len(data)%2 == 1 {
		c = append(c, 0)
	}
	return c
}

// SolidVP8L returns a VP8L lossless bitstream (RFC 9649 section 3, "WebP
// Lossless Bitstream") for an opaque image of one colour. It uses no
// transform, no colour cache, no meta prefix codes, and five prefix codes in
// the one-symbol form of the "Simple Code Length Code", so every pixel costs
// zero bits. Section names are cited rather than numbers, which the
// author only knows from memory.
func SolidVP8L(width, height int, r, g, b byte) []byte {
	var w bitWriter
	w.put(0x2F, 8) // signature 0x2f ("RIFF Header")
	w.put(uint32(width-1), 14)
	w.put(uint32(height-1), 14)
	w.put(0, 1)                                    // alpha_is_used
	w.put(0, 3)                                    // version
	w.put(0, 1)                                    // no transform ("Transforms")
	w.put(0, 1)                                    // no colour cache ("Color Cache Coding")
	w.put(0, 1)                                    // no meta prefix codes ("Decoding of Meta Prefix Codes")
	for _, sym := range []byte{g, r, b, 0xFF, 0} { // green, red, blue, alpha, distance
		w.put(1, 1) // simple code
		w.put(0, 1) // num_symbols - 1
		if sym > 1 {
			w.put(1, 1) // is_first_8bits
			w.put(uint32(sym), 8)
		} else {
			w.put(0, 1)
			w.put(uint32(sym), 1)
		}
	}
	return w.bytes()
}

// bitWriter packs bits least-significant first, as VP8L reads them.
type bitWriter struct {
	buf  []byte
	nbit uint
}

func (w *bitWriter) put(v uint32, n uint) {
	for i := uint(0); i < n; i++ {
		if w.nbit%8 == 0 {
			w.buf = append(w.buf, 0)
		}
		if v>>i&1 == 1 {
			w.buf[len(w.buf)-1] |= 1 << (w.nbit % 8)
		}
		w.nbit++
	}
}

func (w *bitWriter) bytes() []byte { return w.buf }
