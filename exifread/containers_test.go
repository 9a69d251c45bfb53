package exifread

import (
	"bytes"
	"encoding/binary"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

// TestContainerVariants: brands and magic numbers of the same structures
// (ISO/IEC 23008-12 brands 'avif'/'mif1'; TIFF-based raw magic numbers of
// Olympus ORF "IIRO" and Panasonic RW2 "IIU\0", from memory of those formats).
func TestContainerVariants(t *testing.T) {
	pl, err := fullPayload()
	if err != nil {
		t.Fatal(err)
	}
	heic, err := exifwrite.HEIF(pl)
	if err != nil {
		t.Fatal(err)
	}
	avif := bytes.Replace(append([]byte(nil), heic...), []byte("ftypheic"), []byte("ftypavif"), 1)
	avif = bytes.Replace(avif, []byte("mif1heic"), []byte("mif1avif"), 1)
	tiffLE, err := exifwrite.TIFF(exifwrite.Payload{Order: binary.LittleEndian, IFD0: camera()}, fixtures.Gradient(4, 4))
	if err != nil {
		t.Fatal(err)
	}
	orf := append([]byte(nil), tiffLE...)
	copy(orf[:4], "IIRO")
	rw2 := append([]byte(nil), tiffLE...)
	copy(rw2[:4], "IIU\x00")
	for _, tc := range []struct {
		name, container, make string
		data                  []byte
	}{
		{"avif brand", ContainerAVIF, "Gnomon Test Optics", avif},
		{"heic brand", ContainerHEIF, "Gnomon Test Optics", heic},
		{"tiff II", ContainerTIFF, "Gnomon Test Optics", tiffLE},
		{"olympus IIRO", ContainerTIFF, "Gnomon Test Optics", orf},
		{"panasonic IIU", ContainerTIFF, "Gnomon Test Optics", rw2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if bytes.Equal(tc.data[:4], tiffLE[:4]) && tc.name != "tiff II" {
				t.Fatalf("patch failed")
			}
			rec := readBytes(tc.data)
			if rec.Container != tc.container || rec.Make != tc.make || rec.Err != nil {
				t.Errorf("container %q make %q err %v", rec.Container, rec.Make, rec.Err)
			}
		})
	}
}
