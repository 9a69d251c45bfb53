// Package zone decides which IANA time zones hold at a place and which UTC instants
// a camera's wall time can denote there, offline and independently of the host.
//
// Methods:
//   - Zone at a place: the boundary data of github.com/ringsaturn/tzf (tzf-rel-lite,
//     derived from timezone-boundary-builder, ODbL licence), which covers the oceans
//     with nautical zones, read with tzf's exact point-in-polygon rule but decoded and
//     indexed only where it is needed (zonemap.go). Every zone whose polygon holds the
//     point is returned (disputed and overlapping areas give several). The lite data is
//     simplified: within a few kilometres of a border or coast a point may fall in the
//     neighbouring zone or at sea; callers should say so when a place is that close.
//   - Offsets: the IANA tz database copied from the Go toolchain (TZDataVersion),
//     embedded and parsed with time.LoadLocationFromTZData; the host's zoneinfo and
//     $ZONEINFO are never read.
//   - Wall times: Resolve walks the zone's own transitions and reports a wall time as
//     Normal, Skipped (in a gap; both candidate instants, with the offsets before and
//     after the change) or Repeated (in a fold; both instants).
//   - The claimed instant (Finder.Claim) in this order of preference: the photo's
//     offset tag, the examiner's override, the place's zone(s).
//
// Sign conventions: offsets are local minus UTC (+19800 s is UTC+05:30). The tz
// database's Etc/GMT±N names use the POSIX sign, the opposite: Etc/GMT+3 is UTC−03:00.
//
// Limits: the tz database is reliable from 1970 on; earlier offsets are the best
// knowledge of its maintainers and for many places before standard time are local mean
// time. Nautical zones over the sea are what ships should keep, not what they always
// keep. Leap seconds are not represented.
package zone
