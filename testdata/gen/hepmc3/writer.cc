// writer.cc writes the HepMC test files of testdata/gen/hepmc3 with the
// HepMC3 C++ library itself (Debian package libhepmc3-dev), so that the Go
// reader in sim/gen is checked against files it did not write. See
// README.md beside this file; regen.sh builds and runs it.
//
// Five invented neutrino events are defined once, in GeV and mm. They are
// written in HepMC3's own format (Asciiv3) following three generations of
// the NuHepMC conventions, and in the HepMC2 format (IO_GenEvent) with
// HepMC3's HepMC2 writer, in GeV/mm and (converted by the library with
// GenEvent::set_units) in MeV/cm. expected.json lists the defined values,
// in GeV and mm, for the Go test to convert on its own.
//
// Usage: writer OUTDIR
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <memory>
#include <string>
#include <vector>

#include "HepMC3/Attribute.h"
#include "HepMC3/FourVector.h"
#include "HepMC3/GenEvent.h"
#include "HepMC3/GenParticle.h"
#include "HepMC3/GenRunInfo.h"
#include "HepMC3/GenVertex.h"
#include "HepMC3/Units.h"
#include "HepMC3/WriterAscii.h"
#include "HepMC3/WriterAsciiHepMC2.h"

using namespace HepMC3;

namespace {

// Particle and vertex definitions of one invented event, GeV and mm.
struct Part {
    int pdg, status;
    double px, py, pz, m;
    int from; // index of the producing vertex in Ev::verts, -1: incoming
    int to;   // index of the vertex it enters, -1: none
};
struct Vtx {
    int status;
    bool placed; // false: no position of its own (inherits one)
    double x, y, z, ct;
};
struct Ev {
    int number, process;
    double weight;
    std::vector<double> lab; // x y z (mm) [t (s)]; empty: none
    std::vector<Vtx> verts;
    std::vector<Part> parts;
    std::vector<double> shift; // x y z ct (mm) of GenEvent::shift_position_by; empty: none
};

double etot(const Part& p) { return std::sqrt(p.px * p.px + p.py * p.py + p.pz * p.pz + p.m * p.m); }

// PDG 2024 masses, GeV.
const double mMu = 0.1056583755, mE = 0.00051099895, mP = 0.93827208816, mN = 0.93956542052,
             mPi0 = 0.1349768, mO16 = 14.89508, mO15 = 13.97161, mN15 = 13.96837;

std::vector<Ev> events() {
    std::vector<Ev> evs;
    // 101: nu_mu CC quasi-elastic on oxygen, primary vertex placed.
    evs.push_back(Ev{101, 200, 1.25, {100, -50, 25},
                     {{1, true, 10, -20, 30, 1.5}},
                     {{14, 4, 0, 0, 0.8, 0, -1, 0},
                      {1000080160, 11, 0, 0, 0, mO16, -1, 0},
                      {13, 1, 0.1, 0.2, 0.5, mMu, 0, -1},
                      {2212, 1, -0.05, -0.1, 0.25, mP, 0, -1},
                      {1000080150, 1, -0.05, -0.1, 0.05, mO15, 0, -1}}});
    // 102: nu_e CC resonance on oxygen; the pi0 decays at a displaced,
    // placed vertex; lab position with a time (s).
    evs.push_back(Ev{102, 400, 0.75, {-300, 120, 40, 2e-6},
                     {{1, true, 0, 0, 0, 0}, {2, true, 0.5, 0, 0.2, 0.6}},
                     {{12, 4, 0, 0, 1.2, 0, -1, 0},
                      {1000080160, 11, 0, 0, 0, mO16, -1, 0},
                      {11, 1, 0.05, -0.12, 0.6, mE, 0, -1},
                      {2212, 1, 0.02, 0.1, 0.3, mP, 0, -1},
                      {2112, 1, -0.3, 0.25, 0.1, mN, 0, -1},
                      {111, 2, -0.04, 0.01, 0.18, mPi0, 0, 1},
                      {22, 1, -0.03, 0.04, 0.12, 0, 1, -1},
                      {22, 1, -0.01, -0.03, 0.06, 0, 1, -1}}});
    // 103: anti-nu_mu CC quasi-elastic on a free proton; the pi0 of an
    // invented final state decays at a vertex with no position of its own
    // (written implicitly in Asciiv3: it inherits the primary's).
    evs.push_back(Ev{103, 201, 1.0, {0, 0, -700},
                     {{1, true, -2, 4, 6, -0.3}, {0, false, 0, 0, 0, 0}},
                     {{-14, 4, 0.01, 0, 0.9, 0, -1, 0},
                      {2212, 11, 0, 0, 0, mP, -1, 0},
                      {-13, 1, 0.02, -0.05, 0.45, mMu, 0, -1},
                      {2112, 1, 0.0, 0.1, 0.15, mN, 0, -1},
                      {111, 2, -0.01, -0.05, 0.2, mPi0, 0, 1},
                      {22, 1, 0.01, -0.02, 0.15, 0, 1, -1},
                      {22, 1, -0.02, -0.03, 0.05, 0, 1, -1}}});
    // 104: nu_mu NC elastic on oxygen: nothing the simulator tracks.
    evs.push_back(Ev{104, 250, 0.5, {5, 5, 5},
                     {{1, true, 0, 0, 0, 0}},
                     {{14, 4, 0, 0, 0.6, 0, -1, 0},
                      {1000080160, 11, 0, 0, 0, mO16, -1, 0},
                      {14, 1, 0.1, 0.05, 0.45, 0, 0, -1},
                      {1000070150, 1, -0.1, -0.05, 0.15, mN15, 0, -1}}});
    // 105: nu_e elastic scattering off an atomic electron, no target
    // written and no lab position; the vertex has no position of its own
    // and one incoming particle (Asciiv3 writes it implicitly), and the
    // event is shifted (GenEvent::shift_position_by): its particles start
    // at the event position.
    evs.push_back(Ev{105, 700, 2.0, {},
                     {{0, false, 0, 0, 0, 0}},
                     {{12, 4, 0, 0, 0.02, 0, -1, 0},
                      {11, 1, 0.003, 0.001, 0.012, mE, 0, -1},
                      {12, 1, -0.003, -0.001, 0.008, 0, 0, -1}},
                     {30, -40, 50, 0.6}});
    return evs;
}

// Convention: which NuHepMC generation names the attributes.
enum Convention { pre09, v09, v10 };

std::shared_ptr<GenRunInfo> runInfo(Convention c) {
    auto run = std::make_shared<GenRunInfo>();
    run->set_weight_names({"CV"});
    GenRunInfo::ToolInfo tool;
    tool.name = "conelight-testdata-writer";
    tool.version = "1";
    tool.description = "invented events for the sim/gen tests";
    run->tools().push_back(tool);
    int minor = c == pre09 ? 5 : c == v09 ? 9 : 0;
    run->add_attribute("NuHepMC.Version.Major", std::make_shared<IntAttribute>(c == v10 ? 1 : 0));
    run->add_attribute("NuHepMC.Version.Minor", std::make_shared<IntAttribute>(minor));
    run->add_attribute("NuHepMC.Version.Patch", std::make_shared<IntAttribute>(0));
    run->add_attribute("NuHepMC.ProcessIDs", std::make_shared<StringAttribute>("200 201 250 400"));
    return run;
}

// labIn returns the lab_pos attribute text, positions multiplied by
// scale: 0.1 for cm, the event's length unit after set_units(MEV, CM)
// (attributes are not converted by the library).
std::shared_ptr<StringAttribute> labIn(const Ev& e, double scale) {
    std::string lab;
    char buf[64];
    for (size_t i = 0; i < e.lab.size(); i++) {
        double v = i < 3 ? e.lab[i] * scale : e.lab[i];
        std::snprintf(buf, sizeof buf, "%s%.17g", i ? " " : "", v);
        lab += buf;
    }
    return std::make_shared<StringAttribute>(lab);
}

// build makes the HepMC3 event of e in GeV/mm.
std::shared_ptr<GenEvent> build(const Ev& e, Convention c, std::shared_ptr<GenRunInfo> run) {
    auto evt = std::make_shared<GenEvent>(Units::GEV, Units::MM);
    evt->set_run_info(run);
    evt->set_event_number(e.number);
    evt->weights() = {e.weight};
    std::vector<GenVertexPtr> vs;
    for (const auto& v : e.verts) {
        auto gv = std::make_shared<GenVertex>();
        if (v.placed) gv->set_position(FourVector(v.x, v.y, v.z, v.ct));
        gv->set_status(v.status);
        vs.push_back(gv);
    }
    for (const auto& p : e.parts) {
        auto gp = std::make_shared<GenParticle>(FourVector(p.px, p.py, p.pz, etot(p)), p.pdg, p.status);
        gp->set_generated_mass(p.m);
        // Pre-0.9 files mark the target as an incoming beam particle.
        if (c == pre09 && p.status == 11) gp->set_status(4);
        if (p.from >= 0) vs[p.from]->add_particle_out(gp);
        if (p.to >= 0) vs[p.to]->add_particle_in(gp);
    }
    for (auto& v : vs) evt->add_vertex(v);
    std::string procName = c == pre09 ? "ProcID" : "signal_process_id";
    evt->add_attribute(procName, std::make_shared<IntAttribute>(e.process));
    if (!e.lab.empty()) evt->add_attribute(c == v10 ? "lab_pos" : "LabPos", labIn(e, 1));
    return evt;
}

// shift applies the event's shift_position_by in the event's length unit
// (scale 0.1 for cm). It comes after set_units: GenEvent::set_units of
// HepMC3 3.1.2 does not convert the event position.
void shift(GenEvent& evt, const Ev& e, double scale) {
    if (!e.shift.empty())
        evt.shift_position_by(FourVector(e.shift[0] * scale, e.shift[1] * scale, e.shift[2] * scale, e.shift[3] * scale));
}

void writeV3(const std::string& path, Convention c, bool mevcm) {
    auto run = runInfo(c);
    WriterAscii w(path, run);
    for (const auto& e : events()) {
        auto evt = build(e, c, run);
        if (mevcm) {
            evt->set_units(Units::MEV, Units::CM);
            if (!e.lab.empty()) evt->add_attribute(c == v10 ? "lab_pos" : "LabPos", labIn(e, 0.1));
        }
        shift(*evt, e, mevcm ? 0.1 : 1);
        w.write_event(*evt);
    }
    w.close();
}

// writeV2 writes the HepMC2 listing; without run information the events
// carry no weights (HepMC3 3.1's HepMC2 writer then glues an empty weight
// names line to the E line: "... 0N 0").
void writeV2(const std::string& path, bool mevcm, bool withRunInfo) {
    auto run = runInfo(v10);
    WriterAsciiHepMC2 w(path, withRunInfo ? run : std::shared_ptr<GenRunInfo>());
    for (const auto& e : events()) {
        auto evt = build(e, v10, run);
        if (!withRunInfo) {
            evt->set_run_info(std::shared_ptr<GenRunInfo>());
            evt->weights().clear();
        }
        if (mevcm) evt->set_units(Units::MEV, Units::CM);
        shift(*evt, e, mevcm ? 0.1 : 1);
        w.write_event(*evt);
    }
    w.close();
}

void writeJSON(const std::string& path) {
    FILE* f = std::fopen(path.c_str(), "w");
    if (!f) {
        std::perror(path.c_str());
        std::exit(1);
    }
    std::fprintf(f, "{\n  \"units\": \"GeV, mm; lab time s\",\n  \"events\": [\n");
    auto evs = events();
    for (size_t i = 0; i < evs.size(); i++) {
        const Ev& e = evs[i];
        std::fprintf(f, "    {\"number\": %d, \"process\": %d, \"weight\": %.17g, \"lab\": [", e.number, e.process, e.weight);
        for (size_t k = 0; k < e.lab.size(); k++) std::fprintf(f, "%s%.17g", k ? ", " : "", e.lab[k]);
        std::fprintf(f, "], \"shift\": [");
        for (size_t k = 0; k < e.shift.size(); k++) std::fprintf(f, "%s%.17g", k ? ", " : "", e.shift[k]);
        std::fprintf(f, "],\n     \"vertices\": [");
        for (size_t k = 0; k < e.verts.size(); k++) {
            const Vtx& v = e.verts[k];
            std::fprintf(f, "%s{\"status\": %d, \"placed\": %s, \"x\": %.17g, \"y\": %.17g, \"z\": %.17g, \"ct\": %.17g}",
                         k ? ", " : "", v.status, v.placed ? "true" : "false", v.x, v.y, v.z, v.ct);
        }
        std::fprintf(f, "],\n     \"particles\": [\n");
        for (size_t k = 0; k < e.parts.size(); k++) {
            const Part& p = e.parts[k];
            std::fprintf(f, "       {\"pdg\": %d, \"status\": %d, \"px\": %.17g, \"py\": %.17g, \"pz\": %.17g, \"e\": %.17g, \"m\": %.17g, \"from\": %d, \"to\": %d}%s\n",
                         p.pdg, p.status, p.px, p.py, p.pz, etot(p), p.m, p.from, p.to, k + 1 < e.parts.size() ? "," : "");
        }
        std::fprintf(f, "     ]}%s\n", i + 1 < evs.size() ? "," : "");
    }
    std::fprintf(f, "  ]\n}\n");
    std::fclose(f);
}

} // namespace

int main(int argc, char** argv) {
    if (argc != 2) {
        std::fprintf(stderr, "usage: %s OUTDIR\n", argv[0]);
        return 2;
    }
    std::string dir = argv[1];
    writeV3(dir + "/nuhepmc_v1_gev_mm.hepmc3", v10, false);
    writeV3(dir + "/nuhepmc_v09_mev_cm.hepmc3", v09, true);
    writeV3(dir + "/nuhepmc_pre09_gev_mm.hepmc3", pre09, false);
    writeV2(dir + "/hepmc2_gev_mm.hepmc", false, true);
    writeV2(dir + "/hepmc2_mev_cm.hepmc", true, true);
    writeV2(dir + "/hepmc2_noweights_gev_mm.hepmc", false, false);
    writeJSON(dir + "/expected.json");
    return 0;
}
