package exifread

// Options carries the safety limits of the reader. The zero value means the
// defaults below; a field set to a positive value overrides its default.
type Options struct {
	// MaxExifBytes bounds the TIFF payload copied out of a container (JPEG
	// APP1 is at most 64 KiB; HEIF Exif items and PNG eXIf chunks are not bounded
	// by their formats). Default 4 MiB.
	MaxExifBytes int64
	// MaxMetaBoxBytes bounds an HEIF meta box read into memory. Default 4 MiB.
	MaxMetaBoxBytes int64
	// MaxXMPBytes bounds an XMP packet or sidecar. Default 2 MiB.
	MaxXMPBytes int64
	// MaxEntriesPerIFD bounds one TIFF directory. Default 1000.
	MaxEntriesPerIFD int
	// MaxIFDs bounds the number of TIFF directories visited. Default 64.
	MaxIFDs int
	// MaxValueBytes bounds the sum of the declared sizes of all TIFF values;
	// it is what keeps goexif from allocating hundreds of MB for many tags
	// pointing at the same bytes. Default 16 MiB.
	MaxValueBytes int64
	// MaxThumbnailBytes bounds the embedded thumbnail copied out. Default 1 MiB.
	MaxThumbnailBytes int64
	// MaxSegments bounds the JPEG segments, PNG/WebP chunks or HEIF boxes
	// walked. Default 10000.
	MaxSegments int
	// SkipHash skips the SHA-256 of the whole file (metadata-only reading).
	SkipHash bool
	// SkipSidecar skips looking for .xmp sidecars.
	SkipSidecar bool
	// SkipCrossCheck skips decoding the validated payload with goexif as a
	// second opinion.
	SkipCrossCheck bool
}

func (o Options) withDefaults() Options {
	def := func(v *int64, d int64) {
		if *v <= 0 {
			*v = d
		}
	}
	defi := func(v *int, d int) {
		if *v <= 0 {
			*v = d
		}
	}
	def(&o.MaxExifBytes, 4<<20)
	def(&o.MaxMetaBoxBytes, 4<<20)
	def(&o.MaxXMPBytes, 2<<20)
	def(&o.MaxValueBytes, 16<<20)
	def(&o.MaxThumbnailBytes, 1<<20)
	defi(&o.MaxEntriesPerIFD, 1000)
	defi(&o.MaxIFDs, 64)
	defi(&o.MaxSegments, 10000)
	return o
}
