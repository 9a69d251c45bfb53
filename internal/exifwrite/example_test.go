package exifwrite_test

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/color"
	"image/jpeg"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// tinyJPEG encodes a 4x4 grey picture, the base image of the examples.
func tinyJPEG() []byte {
	img := image.NewGray(image.Rect(0, 0, 4, 4))
	for i := range img.Pix {
		img.Pix[i] = 128
	}
	var b bytes.Buffer
	if err := jpeg.Encode(&b, img, nil); err != nil {
		panic(err)
	}
	return b.Bytes()
}

func ExamplePhoto_Payload() {
	p := exifwrite.Photo{
		Make: "Invented Cameras", Model: "IC-1",
		DateTimeOriginal: "2024:06:21 14:03:27", OffsetTimeOriginal: "+02:00",
		GPS: &exifwrite.GPS{LatDeg: 46.5197, LonDeg: 6.6323},
	}
	pl := p.Payload(binary.LittleEndian)
	fmt.Println(len(pl.IFD0), len(pl.Exif), len(pl.GPS), len(pl.IFD1))
	// Output: 6 6 5 0
}

func ExamplePayload_Bytes() {
	pl := exifwrite.Payload{Order: binary.BigEndian, IFD0: []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagMake, "X")}}
	b, err := pl.Bytes()
	if err != nil {
		panic(err)
	}
	fmt.Printf("% X\n", b)
	// Output: 4D 4D 00 2A 00 00 00 08 00 01 01 0F 00 02 00 00 00 02 58 00 00 00 00 00 00 00
}

func ExamplePayload_Build() {
	pl := exifwrite.Payload{
		IFD0:      []exifwrite.Entry{exifwrite.Short(exifwrite.TagOrientation, 1)},
		Exif:      []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagDateTimeOriginal, "2024:06:21 14:03:27")},
		IFD1:      []exifwrite.Entry{exifwrite.Short(exifwrite.TagCompression, 6)},
		Thumbnail: []byte{0xFF, 0xD8, 0xFF, 0xD9},
	}
	_, lay, err := pl.Build()
	if err != nil {
		panic(err)
	}
	// A loop for a reader test: point IFD1's next-IFD link back at IFD0 by
	// writing lay.IFD0 at lay.IFD1Next.
	fmt.Println(lay.IFD0, lay.Exif, lay.IFD1, lay.Thumbnail, lay.IFD1Next)
	// Output: 8 38 76 118 114
}

func ExampleJPEG() {
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.BigEndian).Bytes()
	out, err := exifwrite.JPEG(pl, tinyJPEG(), nil)
	if err != nil {
		panic(err)
	}
	fmt.Printf("% X %q\n", out[:4], out[6:12])
	// Output: FF D8 FF E1 "Exif\x00\x00"
}

func ExampleInsertSegments() {
	xmp := exifwrite.XMPAPP1(exifwrite.XMP(exifwrite.XMPFields{CreateDate: "2024-06-21T14:03:27+02:00"}))
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.BigEndian).Bytes()
	out, err := exifwrite.InsertSegments(tinyJPEG(), xmp, exifwrite.ExifAPP1(pl))
	if err != nil {
		panic(err)
	}
	fmt.Println(bytes.Index(out, []byte("http://ns.adobe.com")) < bytes.Index(out, []byte("Exif\x00\x00")))
	// Output: true
}

func ExamplePNG() {
	// A 1x1 PNG: signature, IHDR, one IDAT, IEND.
	base := append([]byte("\x89PNG\r\n\x1a\n"), exifwrite.PNGChunk("IHDR", []byte{0, 0, 0, 1, 0, 0, 0, 1, 8, 0, 0, 0, 0})...)
	base = append(base, exifwrite.PNGChunk("IDAT", []byte{0x78, 0x9C, 0x63, 0x60, 0x00, 0x00, 0x00, 0x02, 0x00, 0x01})...)
	base = append(base, exifwrite.PNGChunk("IEND", nil)...)
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.BigEndian).Bytes()
	out, err := exifwrite.PNG(pl, base)
	if err != nil {
		panic(err)
	}
	fmt.Println(bytes.Index(out, []byte("eXIf")) < bytes.Index(out, []byte("IDAT")))
	// Output: true
}

func ExamplePNGChunk() {
	fmt.Printf("% X\n", exifwrite.PNGChunk("IEND", nil))
	// Output: 00 00 00 00 49 45 4E 44 AE 42 60 82
}

func ExampleWebP() {
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.LittleEndian).Bytes()
	out, err := exifwrite.WebP(pl, 64, 48)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s %s %s\n", out[:4], out[8:12], out[12:16])
	// Output: RIFF WEBP VP8X
}

func ExampleSolidVP8L() {
	fmt.Printf("% X\n", exifwrite.SolidVP8L(1, 1, 0xFF, 0, 0))
	// Output: 2F 00 00 00 00 88 FE 47 FF 03
}

func ExampleHEIF() {
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.BigEndian).Bytes()
	out, err := exifwrite.HEIF(pl)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s %s\n", out[4:8], out[8:12])
	// Output: ftyp heic
}

func ExampleHEIFWith() {
	pl, _ := exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.BigEndian).Bytes()
	out, err := exifwrite.HEIFWith(pl, exifwrite.HEIFOptions{Idat: true, ExifPrefix: true})
	if err != nil {
		panic(err)
	}
	fmt.Println(bytes.Contains(out, []byte("idat")), bytes.Contains(out, []byte("mdat")))
	// Output: true false
}

func ExampleTIFF() {
	img := image.NewRGBA(image.Rect(0, 0, 2, 2))
	img.Set(0, 0, color.RGBA{255, 0, 0, 255})
	out, err := exifwrite.TIFF(exifwrite.Photo{Make: "Invented Cameras"}.Payload(binary.LittleEndian), img)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%q %d\n", out[:4], len(out))
	// Output: "II*\x00" 312
}

func ExampleXMP() {
	lat, lon := 46.5197, 6.6323
	packet := exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2024-06-21T14:03:27+02:00", LatDeg: &lat, LonDeg: &lon})
	for _, l := range bytes.Split(packet, []byte("\n")) {
		if bytes.Contains(l, []byte(`exif:`)) && !bytes.Contains(l, []byte("xmlns")) {
			fmt.Println(string(bytes.TrimSpace(l)))
		}
	}
	// Output:
	// exif:DateTimeOriginal="2024-06-21T14:03:27+02:00"
	// exif:GPSLatitude="46,31.1820000N"
	// exif:GPSLongitude="6,37.9380000E"/>
}

func ExampleXMPCoordinate() {
	fmt.Println(exifwrite.XMPCoordinate(-0.0015, "E", "W"))
	// Output: 0,00.0900000W
}

func ExampleDMS() {
	dms, neg := exifwrite.DMS(-33.8688)
	fmt.Println(dms, neg)
	// Output: [{33 1} {52 1} {76800 10000}] true
}
