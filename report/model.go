package report

// Audit is the whole report document: what report.json holds, and what the
// CSV, GeoJSON and HTML writers render. It is plain data, filled by the
// audit (cmd/gnomon) from the findings of package solarcheck, so each writer
// can be tested with a hand-made Audit.
//
// Times are RFC 3339 strings (UTC unless the field name says local), angles
// are degrees, offsets are seconds. Optional numbers are pointers: nil means
// "not known", which is different from zero.
type Audit struct {
	Schema  string   `json:"schema"` // always SchemaID
	Tool    Tool     `json:"tool"`
	Run     Run      `json:"run"`
	Photos  []Photo  `json:"photos"`  // sorted by Path
	Cameras []Camera `json:"cameras"` // sorted by ID
}

// SchemaID names the version of this document's layout.
const SchemaID = "gnomon.audit/1"

// Tool identifies the program that wrote the report.
type Tool struct {
	Name      string `json:"name"`
	Version   string `json:"version"`
	GoVersion string `json:"go_version"`
}

// Run records how the report was made, so that it can be reproduced.
// Started and Finished are the only wall-clock fields in the document;
// SOURCE_DATE_EPOCH pins both.
type Run struct {
	Started        string   `json:"started"`
	Finished       string   `json:"finished"`
	CommandLine    []string `json:"command_line"`
	Inputs         []string `json:"inputs"`
	ShadowSheet    string   `json:"shadow_sheet,omitempty"`
	ShadowSheetSHA string   `json:"shadow_sheet_sha256,omitempty"`
	DeltaTModel    string   `json:"delta_t_model"`
	TZDataVersion  string   `json:"tzdata_version"`
	ZoneMapVersion string   `json:"zone_map_version"`
	MagneticModel  string   `json:"magnetic_model"`
	SelfTest       SelfTest `json:"self_test"`
	Counts         Counts   `json:"counts"`
	SheetErrors    []string `json:"sheet_errors"` // "file:line:column: reason"
	Notes          []string `json:"notes"`
}

// SelfTest is the result of the built-in reference checks run before the audit.
type SelfTest struct {
	Passed bool        `json:"passed"`
	Checks []SelfCheck `json:"checks"`
}

// SelfCheck is one built-in reference check.
type SelfCheck struct {
	Name   string `json:"name"`
	Source string `json:"source"` // the published reference it is checked against
	Passed bool   `json:"passed"`
	Detail string `json:"detail"`
}

// Counts adds up the run: Files = sum of ByVerdict.
type Counts struct {
	Files     int            `json:"files"`
	ByVerdict map[string]int `json:"by_verdict"`
	Cameras   int            `json:"cameras_modelled"`
}

// Photo is everything the report says about one file.
type Photo struct {
	Path string `json:"path"` // relative to its input root, slash-separated
	Root string `json:"root"` // the input root as given on the command line
	// ID names the photo uniquely across the inputs, as the sheet template
	// and cameras[] name it: the input's label (its folder name, with parent
	// folders added while two inputs share it), then Path.
	ID           string   `json:"id"`
	SHA256       string   `json:"sha256"`
	Size         int64    `json:"size"`
	Container    string   `json:"container"`
	Camera       string   `json:"camera"`        // camera id, as in Camera.ID (a stable machine key); "" when unknown
	CameraName   string   `json:"camera_name"`   // the camera as written: "Brisa BR-10, serial BR10-2290"
	ClaimedLocal string   `json:"claimed_local"` // the wall time as the camera wrote it, with sub-seconds
	ClaimSource  string   `json:"claim_source"`  // which rule decided the claimed instant
	Zone         string   `json:"zone"`          // IANA name of the place's zone
	ZoneOptions  []string `json:"zone_candidates"`
	ClaimedUTC   string   `json:"claimed_utc"` // "" when the verdict is ambiguous: see Readings
	// Readings are the instants the wall time may denote when it has
	// several (a wall time the zone repeated or skipped at a daylight-saving
	// change, or zones that overlap at the place), each with the outcome of
	// the checks under it; absent when there is one.
	Readings []Reading `json:"readings,omitempty"`
	// ClaimNotes are what deciding the claimed instant noticed, in plain
	// words: a repeated or skipped wall time, overlapping zones, an offset
	// tag or override that took precedence.
	ClaimNotes []string `json:"claim_notes,omitempty"`
	Lat        *float64 `json:"lat"`
	Lon        *float64 `json:"lon"`
	Sun        *SunAt   `json:"sun"` // at the claimed moment and place
	Checks     []Check  `json:"checks"`

	Verdict              string   `json:"verdict"`
	OffsetS              *float64 `json:"offset_s"` // claimed minus evidence
	OffsetLowS           *float64 `json:"offset_low_s"`
	OffsetHighS          *float64 `json:"offset_high_s"`
	CorrectedUTCEarliest string   `json:"corrected_utc_earliest"`
	CorrectedUTCLatest   string   `json:"corrected_utc_latest"`
	// CorrectedLocalEarliest and CorrectedLocalLatest are the same window
	// in the legal time of the place's zone (Zone), ISO 8601 with the
	// offset; "" when the place or the window is unknown.
	CorrectedLocalEarliest string        `json:"corrected_local_earliest"`
	CorrectedLocalLatest   string        `json:"corrected_local_latest"`
	Explanation            string        `json:"explanation"`
	Rejected               []Alternative `json:"rejected_explanations"`
	Error                  string        `json:"error"` // why a file could not be read; "" when fine
	// FileNotes are what the reader noticed about the file that did not
	// stop it: a name extension that does not fit the bytes (a renamed
	// file), damage it read past. Each can matter to an examiner.
	FileNotes []string `json:"file_notes"`
	// GPSRejected says why a GPS position in the file was not used (raw
	// value and reason); the GeoJSON keeps it as a feature with no geometry.
	GPSRejected string `json:"gps_rejected,omitempty"`

	// SeasonBands are the date ranges the shadows fit, nearest the claim
	// first, when no time near the claim does (season_mismatch).
	SeasonBands []SeasonBand `json:"season_bands,omitempty"`
	// FactoryDate marks a capture date that looks like a camera clock
	// reset to its factory default (e.g. 2000-01-01 00:04).
	FactoryDate bool `json:"factory_default_date,omitempty"`

	// ClockReset says, for the first photo after a reset of its camera's
	// clock (cameras[].resets), what happened there; "" for other photos.
	ClockReset string `json:"clock_reset,omitempty"`
	// CameraDriftSPerDay and its 95 % interval are the drift of the
	// photo's camera clock in the segment the photo belongs to (as in
	// cameras[].segments[]); nil when the camera's drift is not determined.
	CameraDriftSPerDay     *float64 `json:"camera_drift_s_per_day"`
	CameraDriftLowSPerDay  *float64 `json:"camera_drift_low_s_per_day"`
	CameraDriftHighSPerDay *float64 `json:"camera_drift_high_s_per_day"`

	// ShadowFix is the place the shadows give at the GPS time, if any.
	ShadowFix *Fix `json:"shadow_fix"`
	// Measured are the sun directions the examiner's sheet gave for this photo.
	Measured []Measured `json:"measured"`

	// Thumbnail is the thumbnail's path relative to the report folder, or "".
	Thumbnail string `json:"-"`
	// SunPath is the sun's track over the claimed day, for the HTML chart.
	SunPath []SunAt `json:"-"`
	// BestFit is the sun at the best-fitting shadow time, for the HTML chart.
	BestFit *SunAt `json:"-"`
}

// Reading is one instant a photo's wall time may denote, with the outcome
// of the checks when the wall time is read so.
type Reading struct {
	UTC          string `json:"utc"`          // RFC 3339
	UTCOffset    string `json:"utc_offset"`   // the offset this reading assumes, "-05:00"
	Abbreviation string `json:"abbreviation"` // the zone's abbreviation for it ("EST"); "" when none
	Zone         string `json:"zone"`         // IANA zone name, or the offset label of an override
	// WallTimeExisted is false for both readings of a wall time the zone
	// skipped: no clock on the legal time there showed it.
	WallTimeExisted bool `json:"wall_time_existed"`
	// Used marks the reading the verdict and figures follow; none is used
	// when the verdict is "ambiguous".
	Used        bool     `json:"used"`
	Verdict     string   `json:"verdict"`
	OffsetS     *float64 `json:"offset_s"` // claimed minus evidence under this reading
	OffsetLowS  *float64 `json:"offset_low_s"`
	OffsetHighS *float64 `json:"offset_high_s"`
	Explanation string   `json:"explanation"`
}

// SunAt is a sun position; Time is RFC 3339 UTC ("" when not meaningful).
type SunAt struct {
	Time     string  `json:"time,omitempty"`
	Azimuth  float64 `json:"azimuth"`
	Altitude float64 `json:"altitude"`
}

// Measured is one sun direction derived from the sheet, with 1-sigma
// uncertainties, for charts and the evidence table.
type Measured struct {
	Object      string  `json:"object"`
	Azimuth     float64 `json:"azimuth"`
	AzimuthSD   float64 `json:"azimuth_sd"`
	Altitude    float64 `json:"altitude"`
	AltitudeSD  float64 `json:"altitude_sd"`
	HasAltitude bool    `json:"has_altitude"`
	// Sheet holds the examiner's values as written, beside the direction
	// derived from them.
	Sheet SheetValues `json:"sheet"`
	// NorthCorrection is what was added to the sheet's bearings to make them
	// true, in degrees: the magnetic declination (east positive) for
	// magnetic bearings, the grid convergence for grid bearings, 0 for true
	// ones. NorthCorrectionSD is its 1-sigma error (the WMM2025 error model
	// for a modelled declination; 0 when the examiner gave it), already
	// part of AzimuthSD.
	NorthCorrection   float64 `json:"north_correction"`
	NorthCorrectionSD float64 `json:"north_correction_sd"`
}

// SheetValues are one measurement-sheet row's values as the examiner wrote
// them; nil where the row has none. Bearings are in the row's north.
type SheetValues struct {
	Kind         string   `json:"kind"`          // "shadow", "shadow_bearing" or "sighting"
	North        string   `json:"north"`         // "true", "magnetic" or "grid"
	Bearing      *float64 `json:"bearing"`       // the shadow's bearing, or the sighted sun azimuth
	ObjectHeight *float64 `json:"object_height"` // any unit; only the ratio to the length counts
	ShadowLength *float64 `json:"shadow_length"` // same unit as the height
	SunAltitude  *float64 `json:"sun_altitude"`  // a sighted altitude
	BearingSD    float64  `json:"bearing_sd"`    // 1-sigma, degrees
	Declination  *float64 `json:"declination"`   // the examiner's own declination, if given
}

// Check is the result of one independent check on one photo.
type Check struct {
	Kind        string   `json:"kind"`
	Status      string   `json:"status"`
	Figure      *float64 `json:"figure"`
	Unit        string   `json:"unit"`
	Uncertainty *float64 `json:"uncertainty"` // half-width of the 95 % interval, same unit
	// MisfitChi2, MisfitDof and MisfitP are the goodness of fit of a check
	// that fits a measurement (shadow_time): χ² at the best time, its
	// degrees of freedom and its p-value. Absent for other checks.
	MisfitChi2 *float64 `json:"misfit_chi2,omitempty"`
	MisfitDof  *int     `json:"misfit_dof,omitempty"`
	MisfitP    *float64 `json:"misfit_p,omitempty"`
	Sentence   string   `json:"sentence"`
}

// SeasonBand is a run of dates (ISO 8601, the place's solar day) on which
// the measured shadows fit the sun, with the signed number of days from
// the band to the claimed date (positive: the band lies before the claim).
type SeasonBand struct {
	First         string  `json:"first"`
	Last          string  `json:"last"`
	DaysFromClaim float64 `json:"days_from_claim"`
	Best          string  `json:"best"` // RFC 3339 UTC time of least misfit in the band
}

// Alternative is an explanation that was tested and rejected, with why.
type Alternative struct {
	Verdict string `json:"verdict"`
	Reason  string `json:"reason"`
}

// Fix is a position with an uncertainty radius.
type Fix struct {
	Lat      float64 `json:"lat"`
	Lon      float64 `json:"lon"`
	RadiusKm float64 `json:"radius_km"`
}

// Camera is one camera's clock model across the batch. The model is of the
// clock, in its own time scale: OffsetS is the clock's error against the
// zone it is set to (ClockZone), or against UTC when that is undecided. The
// top-level figures are those of the segment with the most evidence;
// Segments holds every segment between resets.
type Camera struct {
	ID          string   `json:"id"`   // stable machine key: make|model|serial, case folded
	Name        string   `json:"name"` // as the camera wrote them: "Brisa BR-10, serial BR10-2290"
	Photos      int      `json:"photos"`
	ClockZone   string   `json:"clock_zone"` // "UTC+01:00", or "the zone of each photo's offset tag"; "" when the witnesses do not decide it
	OffsetS     *float64 `json:"offset_s"`
	OffsetLowS  *float64 `json:"offset_low_s"` // 95 % interval of OffsetS
	OffsetHighS *float64 `json:"offset_high_s"`
	OffsetSDs   *float64 `json:"offset_sd_s"`
	// DriftSPerDay and its 95 % interval are nil when no drift can be
	// stated (too few witnessed photos, or too short a span); DriftNote
	// then says why.
	DriftSPerDay     *float64 `json:"drift_s_per_day"`
	DriftLowSPerDay  *float64 `json:"drift_low_s_per_day"`
	DriftHighSPerDay *float64 `json:"drift_high_s_per_day"`
	DriftPPM         *float64 `json:"drift_ppm"`
	DriftNote        string   `json:"drift_note"`
	// OffsetAtUTC is the RFC 3339 moment at which OffsetS holds, so the
	// fitted clock line is OffsetS + DriftSPerDay × (t − OffsetAtUTC) / 1 day.
	// "" means the median ClaimedUTC of Points (the HTML chart falls back to it).
	OffsetAtUTC string         `json:"offset_at_utc"`
	Segments    []ClockSegment `json:"segments"`
	Outliers    []string       `json:"outliers"` // photo paths that disagree with the model
	// Resets are the first photo after each clock reset (a step in the
	// clock, or a fall-back to a factory date), and ResetNotes say, in the
	// same order, what happened there.
	Resets      []string     `json:"resets"`
	ResetNotes  []string     `json:"reset_notes"`
	OrderBreaks []string     `json:"order_breaks"`
	Points      []ClockPoint `json:"points"`
	Note        string       `json:"note"`
}

// ClockSegment is the clock between two resets, with the same fields as
// Camera's top-level figures. From and To are the clock's times (as UTC in
// the zone it is set to) of its first and last witnessed photo.
type ClockSegment struct {
	From             string   `json:"from_utc"`
	To               string   `json:"to_utc"`
	Photos           int      `json:"photos_witnessed"`
	ClockZone        string   `json:"clock_zone"`
	OffsetS          *float64 `json:"offset_s"`
	OffsetLowS       *float64 `json:"offset_low_s"`
	OffsetHighS      *float64 `json:"offset_high_s"`
	OffsetAtUTC      string   `json:"offset_at_utc"`
	DriftSPerDay     *float64 `json:"drift_s_per_day"`
	DriftLowSPerDay  *float64 `json:"drift_low_s_per_day"`
	DriftHighSPerDay *float64 `json:"drift_high_s_per_day"`
	DriftNote        string   `json:"drift_note"`
}

// ClockPoint is one photo's measured offset on a camera's clock chart: the
// clock's time (as UTC in the zone it is set to) and its error there.
type ClockPoint struct {
	Path       string  `json:"path"`
	ClaimedUTC string  `json:"claimed_utc"`
	OffsetS    float64 `json:"offset_s"`
	LowS       float64 `json:"low_s"`
	HighS      float64 `json:"high_s"`
	Outlier    bool    `json:"outlier"`
	Segment    int     `json:"segment"` // index into Camera.Segments
}
