package phys

// Physical constants in conelight units (cm, ns, MeV).
// Source: PDG Review of Particle Physics (2024), table "Physical constants".
const (
	// SpeedOfLight is c in cm/ns.
	SpeedOfLight = 29.9792458
	// FineStructure is the fine-structure constant alpha.
	FineStructure = 1 / 137.035999084
	// ClassicalElectronRadius is r_e in cm.
	ClassicalElectronRadius = 2.8179403262e-13
	// Avogadro is N_A in 1/mol.
	Avogadro = 6.02214076e23
	// BetheK is 4 pi N_A r_e^2 m_e c^2 in MeV mol^-1 cm^2.
	BetheK = 0.307075
	// HbarC is hbar c in MeV fm.
	HbarC = 197.3269804
)

// Masses in MeV (PDG Review 2024 particle listings).
const (
	ElectronMass = 0.51099895000
	MuonMass     = 105.6583755
	ProtonMass   = 938.27208816
	NeutronMass  = 939.56542052
)

// MuonLifetime is the free muon mean life in ns (PDG Review 2024).
const MuonLifetime = 2196.9811

// Charged and neutral pion masses (MeV) and the charged pion mean life
// (ns), PDG Review 2024 particle listings (pi+-: 139.57039 MeV,
// tau = 2.6033e-8 s; pi0: 134.9768 MeV).
const (
	PionMass        = 139.57039
	PionZeroMass    = 134.9768
	PionLifetime    = 26.033
	NeutralPionCode = 111
	PionPlusCode    = 211
	PionMinusCode   = -211
)
