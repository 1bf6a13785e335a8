package examples

import _ "embed"

// Coolant is the demo model: an invented test-rig coolant loop whose
// certificate holds on part of the gain range, with an irrational endpoint.
//
//go:embed coolant.lya
var Coolant []byte

// CoolantName is the file name shown in positions and reports.
const CoolantName = "coolant.lya"
