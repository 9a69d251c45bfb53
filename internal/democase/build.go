package democase

import (
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"hash/fnv"
	"image"
	"image/jpeg"
	"math"
	"math/rand/v2"
	"os"
	"path"
	"path/filepath"
	"runtime"
	"sort"
	"sync"
	"time"

	"golang.org/x/image/draw"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/solarcheck/geomag"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// DefaultSeed is the seed used when Options.Seed is zero.
const DefaultSeed uint64 = 20271009

// TruncateSD bounds every simulated measurement error, in standard
// deviations (see the package doc for why).
const TruncateSD = 1.5

// Stated 1-sigma measurement errors written in every sheet row.
const (
	BearingSDDeg = 2.0
	LengthSDPct  = 5.0
)

// Names of the files Build writes inside the case folder.
const (
	PhotosFolder = "photos"
	SheetName    = "measurements.csv"
	StoryName    = "CASE.txt"
)

// ErrNotEmpty is wrapped when the target folder exists and holds files.
var ErrNotEmpty = errors.New("democase: target folder is not empty")

// Options controls the build.
type Options struct {
	// Seed drives every random choice (camera jitter, sub-seconds,
	// measurement errors). Zero means DefaultSeed.
	Seed uint64
}

// Case is the truth about the built case: plain data for tests and for the
// `gnomon demo` command.
type Case struct {
	Dir       string // the case folder as given to Build
	PhotosDir string // Dir/photos: the folder to audit
	SheetPath string // Dir/measurements.csv
	StoryPath string // Dir/CASE.txt
	Seed      uint64

	Place   Place
	Cameras []Camera
	Photos  []Photo // sorted by Path
}

// Place is where every photo was taken.
type Place struct {
	Name                         string
	LatDeg, LonDeg, ElevationM   float64
	Zone                         string  // IANA zone of the place
	DeclinationDeg               float64 // WMM2025 declination written in the sheet (rounded to 0.1°)
	DeclinationModel, DeclSource string
}

// Photo is one file of the case and the truth about it.
type Photo struct {
	Path   string // relative to PhotosDir, slash-separated
	Camera string // Camera.Key
	SHA256 string
	// Site is where the photo was taken: the boatyard (Place), or a site
	// of a trip in the story.
	Site Site

	TrueUTC       time.Time     // when it was really taken
	ClaimedWall   string        // DateTimeOriginal as written, "YYYY:MM:DD hh:mm:ss"
	ClaimedSubSec string        // SubSecTimeOriginal ("" when not written)
	ClaimedOffset string        // OffsetTimeOriginal ("" when not written)
	ClaimedUTC    time.Time     // the claim read with the offset tag, else in the place's zone
	Offset        time.Duration // ClaimedUTC − TrueUTC (claimed minus truth)

	Fault    Fault
	Expected string // verdict the audit should give
	// Outlier: the audit's model of this camera should flag the photo.
	Outlier bool

	// The sun at the true moment (SPA, apparent altitude).
	SunAzimuthDeg, SunAltitudeDeg float64
	Sunny                         bool
	HasGPS, HasThumbnail          bool
	HasExposure                   bool
	FNumber                       float64
	ExposureTimeSec               float64
	ISO                           int
	EV100                         float64 // exposure value at ISO 100 of the written settings
	Shadows                       []Shadow

	view pose // the camera pose the picture was rendered from
}

// Shadow is one sheet row: the true geometry and what the sheet says.
type Shadow struct {
	Object         string
	HeightM        float64
	TrueLengthM    float64
	TrueBearingDeg float64 // degrees true: sun azimuth + 180°
	SheetLengthM   float64 // as written (noisy, rounded)
	SheetBearing   float64 // as written, in BearingRef
	BearingRef     string  // "true" or "magnetic"
	DeclinationDeg float64 // written for magnetic rows (east positive)
}

// Build writes the invented case into dir and returns its truth. dir must
// not exist or be empty.
func Build(dir string, opt Options) (Case, error) {
	seed := opt.Seed
	if seed == 0 {
		seed = DefaultSeed
	}
	if err := freshDir(dir); err != nil {
		return Case{}, err
	}
	db := zone.NewDB()
	loc, err := db.Load(PlaceZone)
	if err != nil {
		return Case{}, fmt.Errorf("democase: place zone: %w", err)
	}
	home, err := db.Load(homeZone)
	if err != nil {
		return Case{}, fmt.Errorf("democase: home zone: %w", err)
	}
	mid := time.Date(2027, 10, 10, 12, 0, 0, 0, time.UTC)
	field, err := geomag.At(PlaceLatDeg, PlaceLonDeg, PlaceElevationM/1000, mid)
	if err != nil {
		return Case{}, fmt.Errorf("democase: declination: %w", err)
	}
	decl := math.Round(field.Main.DeclinationDeg*10) / 10

	c := Case{Dir: dir, PhotosDir: filepath.Join(dir, PhotosFolder), SheetPath: filepath.Join(dir, SheetName),
		StoryPath: filepath.Join(dir, StoryName), Seed: seed,
		Place: Place{Name: PlaceName, LatDeg: PlaceLatDeg, LonDeg: PlaceLonDeg, ElevationM: PlaceElevationM,
			Zone: PlaceZone, DeclinationDeg: decl, DeclinationModel: field.Model,
			DeclSource: "solarcheck/geomag " + field.Model + " at the place on 2027-10-10"}}
	specs := map[string]cameraSpec{}
	for _, s := range cameraSpecs() {
		specs[s.Key] = s
		c.Cameras = append(c.Cameras, s.Camera)
	}
	counters := map[string]int{"A": 412, "B": 1001, "C": 231, "D": 77, "E": 150, "F": 2004, "G": 1, "T": 3101}

	var jobs []photoJob
	for _, sh := range script() {
		spec := specs[sh.cam]
		site := Site{Name: PlaceName, LatDeg: PlaceLatDeg, LonDeg: PlaceLonDeg, ElevationM: PlaceElevationM, Zone: PlaceZone}
		siteLoc := loc
		if sh.site != nil {
			site = *sh.site
			if siteLoc, err = db.Load(site.Zone); err != nil {
				return Case{}, fmt.Errorf("democase: zone of %s: %w", site.Name, err)
			}
		}
		trueLocal, err := time.ParseInLocation("2006-01-02 15:04:05", sh.local, siteLoc)
		if err != nil {
			return Case{}, fmt.Errorf("democase: script time %q: %w", sh.local, err)
		}
		name := fmt.Sprintf(spec.namePattern, counters[sh.cam])
		if sh.cam == "P" {
			name = fmt.Sprintf(spec.namePattern, trueLocal.Format("20060102_150405"))
		}
		counters[sh.cam]++
		jobs = append(jobs, photoJob{sh: sh, spec: spec, name: name, rel: path.Join(spec.Folder, name),
			trueLocal: trueLocal, seed: seed, loc: siteLoc, maine: loc, home: home, declDeg: decl, photosDir: c.PhotosDir,
			obs: spa.NewObserver(site.LatDeg, site.LonDeg, site.ElevationM), site: site})
	}
	// Photos are independent (each has its own random stream), so they are
	// made in parallel and gathered in script order: the output does not
	// depend on scheduling.
	type result struct {
		p    Photo
		rows [][]string
		err  error
	}
	results := make([]result, len(jobs))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for i := range jobs {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer wg.Done()
			defer func() { <-sem }()
			p, rows, err := makePhoto(jobs[i])
			results[i] = result{p, rows, err}
		}()
	}
	wg.Wait()
	var rows [][]string
	for _, r := range results {
		if r.err != nil {
			return Case{}, r.err
		}
		c.Photos = append(c.Photos, r.p)
		rows = append(rows, r.rows...)
	}
	sort.Slice(c.Photos, func(i, j int) bool { return c.Photos[i].Path < c.Photos[j].Path })
	sort.SliceStable(rows, func(i, j int) bool { return rows[i][0] < rows[j][0] })
	if err := writeSheet(c.SheetPath, rows); err != nil {
		return Case{}, err
	}
	if err := os.WriteFile(c.StoryPath, []byte(story(c)), 0o644); err != nil {
		return Case{}, fmt.Errorf("democase: %w", err)
	}
	return c, nil
}

// photoJob is everything makePhoto needs for one photo.
type photoJob struct {
	sh        shot
	spec      cameraSpec
	name, rel string
	trueLocal time.Time
	seed      uint64
	loc, home *time.Location // the zone where the photo was taken; Camera C's home zone
	maine     *time.Location // the boatyard's zone, where the traveller's clock was set
	declDeg   float64
	photosDir string
	obs       spa.Observer
	site      Site
}

// makePhoto renders one photo, writes it with its EXIF and returns its
// truth and its sheet rows.
func makePhoto(j photoJob) (Photo, [][]string, error) {
	sh, spec, name, rel, trueLocal, loc, home, decl, obs := j.sh, j.spec, j.name, j.rel, j.trueLocal, j.loc, j.home, j.declDeg, j.obs
	rng := rand.New(rand.NewPCG(j.seed, nameHash(rel)))

	// True instant with a sub-second part.
	ms := rng.IntN(1000)
	trueUTC := trueLocal.Add(time.Duration(ms) * time.Millisecond).UTC()
	pos := spa.At(trueUTC, obs, spa.DeltaT(trueUTC))

	p := Photo{Path: rel, Camera: sh.cam, Site: j.site, TrueUTC: trueUTC, Fault: sh.fault, Expected: expectedVerdict(sh.fault),
		Outlier: sh.fault == FaultEdited, SunAzimuthDeg: pos.AzimuthDeg, SunAltitudeDeg: pos.AltitudeDeg,
		Sunny: sh.sunny, HasGPS: spec.HasGPS, HasThumbnail: spec.thumbnail}

	claimedWall, err := claimWall(sh, trueUTC, loc, home, j.maine)
	if err != nil {
		return Photo{}, nil, err
	}
	p.ClaimedWall = claimedWall.Format("2006:01:02 15:04:05")
	claimLoc := loc
	if spec.offsetTags {
		_, offSec := trueUTC.In(loc).Zone()
		p.ClaimedOffset = formatOffset(offSec)
		claimLoc = time.FixedZone(p.ClaimedOffset, offSec)
	}
	if spec.HasGPS {
		p.ClaimedSubSec = fmt.Sprintf("%03d", ms)
	}
	cu, err := time.ParseInLocation("2006:01:02 15:04:05", p.ClaimedWall, claimLoc)
	if err != nil {
		return Photo{}, nil, fmt.Errorf("democase: claimed wall %q: %w", p.ClaimedWall, err)
	}
	if spec.HasGPS {
		cu = cu.Add(time.Duration(ms) * time.Millisecond)
	}
	p.ClaimedUTC = cu.UTC()
	p.Offset = p.ClaimedUTC.Sub(trueUTC)

	// The picture.
	ps := jitter(spec.view, rng)
	p.view = ps
	sun := sunState{sunny: sh.sunny, azimuthDeg: pos.AzimuthDeg, altitudeDeg: pos.AltitudeDeg}
	img := render(ps, sun, "FICTIONAL DEMO DATA - "+name)
	main, thumb, err := encode(img, spec.thumbnail)
	if err != nil {
		return Photo{}, nil, fmt.Errorf("democase: %s: %w", rel, err)
	}

	// The metadata.
	ep := exifwrite.Photo{Make: spec.Make, Model: spec.Model, BodySerial: spec.Serial,
		DateTimeOriginal: p.ClaimedWall, Thumbnail: thumb}
	if sh.cam != "G" {
		ep.Orientation = 1
		ep.DateTime, ep.DateTimeDigitized = p.ClaimedWall, p.ClaimedWall
		ep.PixelWidth, ep.PixelHeight = ImageWidth, ImageHeight
		ep.OffsetTimeOriginal, ep.OffsetTime, ep.OffsetTimeDigitized = p.ClaimedOffset, p.ClaimedOffset, p.ClaimedOffset
		ep.SubSecOriginal, ep.SubSecDigitized = p.ClaimedSubSec, p.ClaimedSubSec
		ep.FocalLength = exifwrite.Rational{Num: uint32(math.Round(spec.focalMM * 10)), Den: 10}
		ep.FocalLength35 = spec.focal35
		ep.Flash = exifwrite.Ptr(16) // flash off, did not fire (Exif 2.32 table 8)
		n, t, ev := exposureFor(pos.AltitudeDeg, spec.fNumber, spec.iso)
		if sh.fault == FaultNightClaim { // the setting named in the story
			n, t = 8, exifwrite.Rational{Num: 1, Den: 500}
			ev = math.Log2(64 / t.Float())
		}
		ep.FNumber, ep.ExposureTime, ep.ISO = exifwrite.Rational{Num: uint32(math.Round(n * 10)), Den: 10}, t, spec.iso
		p.HasExposure, p.FNumber, p.ExposureTimeSec, p.ISO = true, n, t.Float(), spec.iso
		p.EV100 = ev
	}
	if spec.HasGPS {
		ep.Software = "PeloraOS 14.2"
		ep.GPS = gpsBlock(trueUTC, ps, j.site, rng)
	}
	order := binary.ByteOrder(binary.BigEndian)
	if spec.little {
		order = binary.LittleEndian
	}
	payload, err := ep.Payload(order).Bytes()
	if err != nil {
		return Photo{}, nil, fmt.Errorf("democase: %s: exif: %w", rel, err)
	}
	file, err := exifwrite.JPEG(payload, main, nil)
	if err != nil {
		return Photo{}, nil, fmt.Errorf("democase: %s: jpeg: %w", rel, err)
	}
	full := filepath.Join(j.photosDir, filepath.FromSlash(rel))
	if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
		return Photo{}, nil, fmt.Errorf("democase: %w", err)
	}
	if err := os.WriteFile(full, file, 0o644); err != nil {
		return Photo{}, nil, fmt.Errorf("democase: %w", err)
	}
	sum := sha256.Sum256(file)
	p.SHA256 = hex.EncodeToString(sum[:])

	// The examiner's measurements.
	if sh.shadows {
		p.Shadows = measure(ps, sun, spec, decl, rng)
		if len(p.Shadows) < 2 {
			return Photo{}, nil, fmt.Errorf("democase: %s: only %d measurable shadows in view", rel, len(p.Shadows))
		}
	}
	return p, sheetRows(p, spec, sh), nil
}

// freshDir makes dir, or accepts it when it exists and is empty.
func freshDir(dir string) error {
	entries, err := os.ReadDir(dir)
	switch {
	case err == nil && len(entries) > 0:
		return fmt.Errorf("%w: %s", ErrNotEmpty, dir)
	case err == nil:
		return nil
	case errors.Is(err, os.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("democase: %w", err)
		}
		return nil
	}
	return fmt.Errorf("democase: %w", err)
}

func nameHash(s string) uint64 {
	h := fnv.New64a()
	h.Write([]byte(s))
	return h.Sum64()
}

// normal draws a standard normal deviate by the Box–Muller transform from
// the PCG stream (our own, so the sequence does not depend on the Go
// release's choice of algorithm), redrawn until |z| ≤ TruncateSD.
func normal(r *rand.Rand) float64 {
	for {
		u1 := (float64(r.Uint64()>>11) + 0.5) / (1 << 53)
		u2 := float64(r.Uint64()>>11) / (1 << 53)
		z := math.Sqrt(-2*math.Log(u1)) * math.Cos(2*math.Pi*u2)
		if math.Abs(z) <= TruncateSD {
			return z
		}
	}
}

// claimWall is the wall time the camera wrote, before any offset tag: loc
// is the zone of the place, home Camera C's zone, maine the boatyard's.
func claimWall(sh shot, trueUTC time.Time, loc, home, maine *time.Location) (time.Time, error) {
	local := trueUTC.In(loc)
	var w time.Time
	switch sh.fault {
	case FaultDrift:
		ahead := driftStart + time.Duration(float64(driftPerDay)*trueUTC.Sub(driftEpoch).Hours()/24)
		w = trueUTC.Add(ahead).In(loc)
	case FaultHomeZone:
		w = trueUTC.In(home)
	case FaultHomeTime:
		w = trueUTC.In(maine)
	case FaultDST:
		// The clock kept daylight time (UTC−4) after the change to standard time.
		w = trueUTC.In(time.FixedZone("EDT", -4*3600))
	case FaultAMPM:
		w = local.Add(12 * time.Hour)
	case FaultEdited:
		w = local.Add(sh.editBy)
	case FaultNightClaim:
		t, err := time.Parse("2006-01-02 15:04:05", sh.claimed)
		if err != nil {
			return time.Time{}, fmt.Errorf("democase: night claim %q: %w", sh.claimed, err)
		}
		return t, nil
	default:
		w = local
	}
	// A camera writes whole seconds: drop the fraction (wall fields only).
	return time.Date(w.Year(), w.Month(), w.Day(), w.Hour(), w.Minute(), w.Second(), 0, time.UTC), nil
}

func formatOffset(sec int) string {
	sign := '+'
	if sec < 0 {
		sign, sec = '-', -sec
	}
	return fmt.Sprintf("%c%02d:%02d", sign, sec/3600, sec%3600/60)
}

// jitter moves the camera a little between photos.
func jitter(p pose, r *rand.Rand) pose {
	p.X += (r.Float64()*2 - 1) * 0.8
	p.Y += (r.Float64()*2 - 1) * 0.8
	p.HeadingDeg += (r.Float64()*2 - 1) * 4
	p.PitchDeg += (r.Float64()*2 - 1) * 1
	return p
}

// encode compresses the picture and, when asked, a 160×120 thumbnail.
func encode(img *image.RGBA, withThumb bool) (main, thumb []byte, err error) {
	var b bytes.Buffer
	if err := jpeg.Encode(&b, img, &jpeg.Options{Quality: 80}); err != nil {
		return nil, nil, err
	}
	if !withThumb {
		return b.Bytes(), nil, nil
	}
	small := image.NewRGBA(image.Rect(0, 0, 160, 120))
	draw.ApproxBiLinear.Scale(small, small.Bounds(), img, img.Bounds(), draw.Src, nil)
	var tb bytes.Buffer
	if err := jpeg.Encode(&tb, small, &jpeg.Options{Quality: 70}); err != nil {
		return nil, nil, err
	}
	return b.Bytes(), tb.Bytes(), nil
}

// gpsBlock is what the receiver wrote: the true UTC of the fix and the
// position at the site a couple of metres off.
func gpsBlock(trueUTC time.Time, ps pose, site Site, r *rand.Rand) *exifwrite.GPS {
	const mPerDegLat = 111_320.0
	dn, de := normal(r)*2, normal(r)*2
	lat := site.LatDeg + (ps.Y+dn)/mPerDegLat
	lon := site.LonDeg + (ps.X+de)/(mPerDegLat*math.Cos(angle.Rad(site.LatDeg)))
	cs := trueUTC.Second()*100 + trueUTC.Nanosecond()/1e7
	heading := math.Mod(ps.HeadingDeg+360, 360)
	return &exifwrite.GPS{
		LatDeg: math.Round(lat*1e6) / 1e6, LonDeg: math.Round(lon*1e6) / 1e6,
		AltitudeM: exifwrite.Ptr(site.ElevationM + 1.5),
		DateStamp: trueUTC.Format("2006:01:02"),
		TimeStamp: [3]exifwrite.Rational{{Num: uint32(trueUTC.Hour()), Den: 1}, {Num: uint32(trueUTC.Minute()), Den: 1},
			{Num: uint32(cs), Den: 100}},
		ImgDirection:    exifwrite.Rational{Num: uint32(math.Round(heading * 100)), Den: 100},
		ImgDirectionRef: "T",
		HPosError:       exifwrite.Rational{Num: 4, Den: 1},
		MapDatum:        "WGS-84",
	}
}
