package exifwrite

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"hash/crc32"
)

var pngSig = []byte{0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'}

// PNG returns pngData with an eXIf chunk holding payload placed before the
// first IDAT (PNG Third Edition, eXIf chunk: it must precede IDAT);
// any existing eXIf chunk is dropped. Every input chunk's CRC is checked, so
// a damaged base is an error, not a silently copied defect.
func PNG(payload, pngData []byte) ([]byte, error) {
	if !bytes.HasPrefix(pngData, pngSig) {
		return nil, fmt.Errorf("png: missing signature: %w", ErrInvalid)
	}
	out := append([]byte(nil), pngSig...)
	pos := len(pngSig)
	inserted := false
	for pos < len(pngData) {
		if pos+12 > len(pngData) {
			return nil, fmt.Errorf("png: truncated chunk at %d: %w", pos, ErrInvalid)
		}
		n := uint64(binary.BigEndian.Uint32(pngData[pos:]))
		end := uint64(pos) + 12 + n
		if end > uint64(len(pngData)) {
			return nil, fmt.Errorf("png: chunk at %d overruns the file: %w", pos, ErrInvalid)
		}
		chunk := pngData[pos:end]
		typ := string(chunk[4:8])
		if crc32.ChecksumIEEE(chunk[4:8+n]) != binary.BigEndian.Uint32(chunk[8+n:]) {
			return nil, fmt.Errorf("png: chunk %q at %d has a bad CRC: %w", typ, pos, ErrInvalid)
		}
		pos = int(end)
		if typ == "eXIf" {
			continue
		}
		if typ == "IDAT" && !inserted {
			out = append(out, PNGChunk("eXIf", payload)...)
			inserted = true
		}
		out = append(out, chunk...)
	}
	if !inserted {
		return nil, fmt.Errorf("png: no IDAT chunk: %w", ErrInvalid)
	}
	return out, nil
}

// PNGChunk encodes one PNG chunk: length, type, data, CRC-32 over type and
// data (PNG section 5.3).
func PNGChunk(typ string, data []byte) []byte {
	c := make([]byte, 8, 12+len(data))
	binary.BigEndian.PutUint32(c, uint32(len(data)))
	copy(c[4:], typ)
	c = append(c, data...)
	return binary.BigEndian.AppendUint32(c, crc32.ChecksumIEEE(c[4:]))
}
