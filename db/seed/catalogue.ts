import { createHash } from "node:crypto";
import type { Transaction } from "kysely";
import PDFDocument from "pdfkit";
import type { Database } from "@/db/schema";
import type { Packaging, ProcessingFlag, SetClass, SterilisationMethod } from "@/lib/catalogue/vocabulary";
import { fileStore } from "@/lib/storage/store";
import type { SeedResult } from "./demo";

// The demo's set catalogues: every customer's set types with generic contents lists, weights and
// sizes in sterilisation units, a few loaner sets (all but one with instructions for use), and the
// IFU PDFs themselves, written with pdfkit from fixed text so every run makes the same bytes.
// Instrument names are generic trade vocabulary; no supplier or product is named.

type Line = readonly [name: string, count: number];

interface DemoSetType {
  code: string;
  name: string;
  setClass: SetClass;
  packaging: Packaging;
  method: SterilisationMethod;
  flags?: ProcessingFlag[];
  weightKg: number;
  sizeStu: number;
  notes?: string;
  items: readonly Line[];
  /** Filed with an instructions-for-use PDF. */
  ifu?: boolean;
}

/** Joins blocks of contents, adding up the counts of an instrument that appears in several. */
function kit(...blocks: (readonly Line[])[]): Line[] {
  const counts = new Map<string, number>();
  for (const block of blocks) for (const [name, count] of block) counts.set(name, (counts.get(name) ?? 0) + count);
  return [...counts.entries()];
}

// ---------------------------------------------------------------------------------------------
// Building blocks of contents lists

const MINOR: Line[] = [
  ["Scalpel handle No. 3", 1],
  ["Dissecting forceps, toothed 145 mm", 2],
  ["Dissecting forceps, non-toothed 145 mm", 1],
  ["Adson forceps, toothed 120 mm", 1],
  ["Iris scissors, curved 115 mm", 1],
  ["Suture scissors, straight 145 mm", 1],
  ["Needle holder, Mayo-Hegar 160 mm", 1],
  ["Artery forceps, Halsted mosquito curved 125 mm", 4],
  ["Towel clip, Backhaus 110 mm", 4],
  ["Skin hook, single 160 mm", 2],
  ["Gallipot 60 ml", 1],
];

const GENERAL: Line[] = [
  ["Scalpel handle No. 3", 1],
  ["Scalpel handle No. 4", 2],
  ["Dissecting forceps, toothed 145 mm", 2],
  ["Dissecting forceps, non-toothed 145 mm", 2],
  ["Mayo scissors, curved 170 mm", 1],
  ["Mayo scissors, straight 170 mm", 1],
  ["Metzenbaum scissors, curved 180 mm", 1],
  ["Needle holder, Mayo-Hegar 160 mm", 2],
  ["Artery forceps, Spencer Wells curved 160 mm", 6],
  ["Artery forceps, Halsted mosquito curved 125 mm", 6],
  ["Tissue forceps, Allis 150 mm", 4],
  ["Towel clip, Backhaus 130 mm", 6],
  ["Sponge-holding forceps, Rampley 240 mm", 2],
  ["Langenbeck retractor 220 mm", 2],
  ["Gallipot 60 ml", 2],
  ["Kidney dish 250 mm", 1],
];

const ABDOMINAL: Line[] = [
  ["Scalpel handle No. 4, long 200 mm", 1],
  ["Dissecting forceps, DeBakey 200 mm", 2],
  ["Metzenbaum scissors, curved 230 mm", 1],
  ["Needle holder, Mayo-Hegar 200 mm", 2],
  ["Artery forceps, Roberts curved 230 mm", 4],
  ["Tissue forceps, Babcock 200 mm", 4],
  ["Intestinal clamp, Doyen curved 230 mm", 2],
  ["Deaver retractor 25 mm", 1],
  ["Deaver retractor 38 mm", 1],
  ["Morris retractor 60 × 50 mm", 2],
  ["Self-retaining retractor, Balfour with centre blade", 1],
  ["Malleable retractor 25 mm", 1],
  ["Suction tube, Yankauer", 1],
  ["Suction tube, Poole", 1],
];

const ORTHO: Line[] = [
  ["Bone holding forceps, self-centring 200 mm", 2],
  ["Bone lever, Hohmann 18 mm", 4],
  ["Bone lever, Hohmann 43 mm", 2],
  ["Periosteal elevator, Farabeuf 8 mm", 1],
  ["Periosteal elevator, Langenbeck 13 mm", 1],
  ["Bone curette, Volkmann size 2", 1],
  ["Bone curette, Volkmann size 4", 1],
  ["Bone rongeur, double action curved 230 mm", 1],
  ["Bone cutting forceps, Liston 200 mm", 1],
  ["Osteotome, straight 10 mm", 1],
  ["Osteotome, straight 20 mm", 1],
  ["Mallet, nylon head 500 g", 1],
  ["Self-retaining retractor, Gelpi 170 mm", 2],
  ["Self-retaining retractor, Travers 180 mm", 1],
  ["Wire cutter, heavy 230 mm", 1],
  ["Suction tube, Frazier 10 Ch", 1],
];

const GYNAE: Line[] = [
  ["Hysterectomy clamp, straight 220 mm", 4],
  ["Hysterectomy clamp, curved 220 mm", 4],
  ["Vulsellum forceps, 4-tooth 250 mm", 2],
  ["Uterine dilators, Hegar set 3–12 mm", 1],
  ["Uterine sound, malleable", 1],
  ["Vaginal speculum, Sims medium", 1],
  ["Vaginal speculum, Auvard weighted", 1],
];

const ENT: Line[] = [
  ["Nasal speculum, Thudichum medium", 1],
  ["Nasal speculum, Killian 75 mm", 1],
  ["Bayonet forceps, Tilley 140 mm", 1],
  ["Nasal forceps, Blakesley straight", 1],
  ["Suction tube, Frazier 8 Ch", 1],
  ["Suction tube, Frazier 10 Ch", 1],
];

const MICRO_EYE: Line[] = [
  ["Eyelid speculum, wire adjustable", 1],
  ["Tying forceps, straight 0.3 mm platform", 1],
  ["Colibri forceps 0.12 mm", 1],
  ["Micro needle holder, curved non-locking", 1],
  ["Corneal scissors, curved", 1],
  ["Westcott scissors, curved blunt", 1],
  ["Iris repositor, double-ended", 1],
];

const LAPAROSCOPY: Line[] = [
  ["Trocar 5 mm with reusable cannula", 3],
  ["Trocar 10–12 mm with reusable cannula", 2],
  ["Veress needle 120 mm", 1],
  ["Grasping forceps, atraumatic 5 mm", 2],
  ["Maryland dissector 5 mm", 1],
  ["Laparoscopic scissors, curved 5 mm", 1],
  ["Suction-irrigation tube 5 mm", 1],
  ["Monopolar hook electrode 5 mm", 1],
  ["Reducer cap 10 to 5 mm", 2],
  ["Light cable 2.5 m", 1],
];

const DENTAL_EXAM: Line[] = [
  ["Mouth mirror handle with mirror head No. 4", 1],
  ["Dental probe, double-ended", 1],
  ["Periodontal probe, graduated", 1],
  ["Tweezers, college pattern", 1],
];

const VET_SOFT: Line[] = [
  ["Scalpel handle No. 3", 1],
  ["Dissecting forceps, toothed 145 mm", 1],
  ["Adson-Brown forceps 120 mm", 1],
  ["Mayo scissors, curved 145 mm", 1],
  ["Metzenbaum scissors, curved 145 mm", 1],
  ["Needle holder, Mayo-Hegar 140 mm", 1],
  ["Artery forceps, Halsted mosquito curved 125 mm", 4],
  ["Artery forceps, Kelly curved 140 mm", 2],
  ["Towel clip, Backhaus 90 mm", 4],
  ["Suture scissors, straight 130 mm", 1],
  ["Gallipot 60 ml", 1],
];

// ---------------------------------------------------------------------------------------------
// The catalogues, by organisation short code

const QUILLBY: DemoSetType[] = [
  // General surgery
  { code: "GEN-MIN-01", name: "Minor general set", setClass: "basic_tray", packaging: "wrap", method: "steam_134", weightKg: 1.85, sizeStu: 0.5, items: kit(MINOR) },
  {
    code: "GEN-MAJ-01",
    name: "Major laparotomy set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle"],
    weightKg: 9.6,
    sizeStu: 1,
    notes: "Balfour retractor: take the centre blade off the frame before washing.",
    items: kit(GENERAL, ABDOMINAL),
  },
  {
    code: "GEN-HER-01",
    name: "Inguinal hernia set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 3.1,
    sizeStu: 0.5,
    items: kit(MINOR, [["Langenbeck retractor 220 mm", 2], ["Self-retaining retractor, West 135 mm", 1], ["Tissue forceps, Allis 150 mm", 2], ["Mayo scissors, curved 170 mm", 1]]),
  },
  {
    code: "GEN-APP-01",
    name: "Appendicectomy set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 3.4,
    sizeStu: 0.5,
    items: kit(MINOR, [["Tissue forceps, Babcock 160 mm", 2], ["Artery forceps, Spencer Wells curved 160 mm", 4], ["Czerny retractor 180 mm", 2], ["Suction tube, Yankauer", 1]]),
  },
  {
    code: "GEN-THY-01",
    name: "Thyroid and neck set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 5.2,
    sizeStu: 1,
    items: kit(GENERAL, [["Self-retaining retractor, Joll", 1], ["Swab holder, curved 180 mm", 2], ["Thyroid retractor, Kocher", 2], ["Bipolar forceps, bayonet 195 mm", 1]]),
  },
  {
    code: "GEN-BRE-01",
    name: "Breast surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 3.6,
    sizeStu: 0.5,
    items: kit(MINOR, [["Mayo scissors, curved 170 mm", 1], ["Tissue forceps, Littlewood 190 mm", 4], ["Cat's paw retractor 160 mm", 2], ["Langenbeck retractor 220 mm", 2]]),
  },
  {
    code: "GEN-BOW-01",
    name: "Bowel resection supplement",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.7,
    sizeStu: 0.5,
    notes: "Used with GEN-MAJ-01; pack the clamps in matched pairs.",
    items: [
      ["Intestinal clamp, Doyen straight 230 mm", 2],
      ["Intestinal clamp, Doyen curved 230 mm", 2],
      ["Intestinal clamp, Payr crushing 250 mm", 2],
      ["Tissue forceps, Babcock 200 mm", 4],
      ["Purse-string clamp", 1],
      ["Metzenbaum scissors, curved 230 mm", 1],
    ],
  },
  {
    code: "GEN-VAS-01",
    name: "Vascular set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 6.8,
    sizeStu: 1,
    items: kit(GENERAL, [
      ["Vascular clamp, DeBakey angled 240 mm", 2],
      ["Bulldog clamp, straight 45 mm", 4],
      ["Potts scissors, 45° angled", 1],
      ["Needle holder, Ryder fine 180 mm", 2],
      ["Dissecting forceps, DeBakey 200 mm", 2],
      ["Vessel loop introducer", 1],
    ]),
  },
  {
    code: "GEN-SKN-01",
    name: "Skin graft set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.2,
    sizeStu: 0.5,
    items: kit(MINOR, [["Skin graft knife handle, Watson", 1], ["Graft spreading board", 2], ["Skin graft mesher carrier", 1]]),
  },
  {
    code: "GEN-CHD-01",
    name: "Chest drain insertion set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.2,
    sizeStu: 0.25,
    items: [
      ["Scalpel handle No. 3", 1],
      ["Artery forceps, Roberts curved 230 mm", 2],
      ["Dissecting forceps, toothed 145 mm", 1],
      ["Needle holder, Mayo-Hegar 160 mm", 1],
      ["Suture scissors, straight 145 mm", 1],
      ["Gallipot 60 ml", 1],
    ],
  },
  // Orthopaedics
  {
    code: "ORTH-MAJ-01",
    name: "Major orthopaedic set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["ultrasonic"],
    weightKg: 10.4,
    sizeStu: 1,
    notes: "Heavy set: two people lift the container. Rongeur and cutting forceps go in the ultrasonic bath open.",
    items: kit(GENERAL, ORTHO),
  },
  {
    code: "ORTH-SMF-01",
    name: "Small fragment instruments",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "ultrasonic", "lumens_to_flush"],
    weightKg: 7.4,
    sizeStu: 1,
    notes: "Flush every cannulated drill bit and the drill guides. Screw rack stays in the tray; count screws by size.",
    items: [
      ["Drill bit 2.5 mm, quick coupling", 2],
      ["Drill bit 3.5 mm, quick coupling", 2],
      ["Drill guide 3.5/2.5 mm", 1],
      ["Depth gauge for screws to 60 mm", 1],
      ["Tap 3.5 mm for cortex screws", 1],
      ["Hexagonal screwdriver 2.5 mm", 2],
      ["Screw holding sleeve", 1],
      ["Plate bending pliers", 2],
      ["Reduction forceps with points 130 mm", 2],
      ["Bone holding forceps, self-centring 200 mm", 1],
      ["Countersink for 3.5 mm screws", 1],
      ["Screw rack with lid", 1],
    ],
  },
  {
    code: "ORTH-HAND-01",
    name: "Hand surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.4,
    sizeStu: 0.5,
    items: kit(MINOR, [
      ["Self-retaining retractor, Weitlaner 110 mm", 1],
      ["Senn retractor, double-ended", 2],
      ["Tenotomy scissors, curved 115 mm", 1],
      ["Periosteal elevator, Freer double-ended", 1],
      ["Bone rongeur, fine curved 150 mm", 1],
    ]),
  },
  {
    code: "ORTH-ARTH-01",
    name: "Knee arthroscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 4.3,
    sizeStu: 1,
    notes: "Take the arthroscope sheath apart and flush the stopcocks. Scope travels separately (ORTH-SCP-01).",
    items: [
      ["Arthroscope sheath 5.5 mm with two stopcocks", 1],
      ["Blunt obturator 5.5 mm", 1],
      ["Sharp trocar 5.5 mm", 1],
      ["Probe, 90° hook 3 mm", 1],
      ["Basket punch, straight 3.4 mm", 1],
      ["Basket punch, up-biting 3.4 mm", 1],
      ["Grasping forceps, 3.4 mm", 1],
      ["Outflow cannula 4.5 mm", 1],
      ["Scalpel handle No. 3", 1],
    ],
  },
  {
    code: "ORTH-SCP-01",
    name: "Arthroscope 4 mm 30°",
    setClass: "single_instrument",
    packaging: "double_pouch",
    method: "steam_134",
    flags: ["manual_wash_only"],
    weightKg: 0.35,
    sizeStu: 0.1,
    notes: "Wash by hand; no ultrasonic bath. Check the image through the eyepiece before packing.",
    items: [["Arthroscope 4 mm 30°, autoclavable", 1]],
  },
  {
    code: "ORTH-PWR-01",
    name: "Battery drill and saw set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["manual_wash_only", "dismantle"],
    weightKg: 6.1,
    sizeStu: 1,
    notes: "Batteries never go through the washer or the steriliser: they are cleaned by wipe and sent back in the clean battery box.",
    items: [
      ["Battery drill handpiece", 1],
      ["Oscillating saw handpiece", 1],
      ["Keyless chuck attachment", 1],
      ["Wire driver attachment", 1],
      ["Battery transfer shield", 2],
      ["Chuck key", 1],
    ],
    ifu: true,
  },
  {
    code: "ORTH-AMP-01",
    name: "Amputation set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 7.9,
    sizeStu: 1,
    items: kit(GENERAL, [
      ["Amputation saw, Gigli handles (pair)", 1],
      ["Gigli saw wire 400 mm", 2],
      ["Amputation knife, Liston 200 mm", 1],
      ["Bone cutting forceps, Liston 200 mm", 1],
      ["Bone file, double-ended", 1],
      ["Amputation retractor, cloth", 1],
    ]),
  },
  {
    code: "ORTH-LN-HIP-01",
    name: "Loaner hip revision instruments",
    setClass: "loaner_set",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "ultrasonic", "lumens_to_flush"],
    weightKg: 11.2,
    sizeStu: 2,
    notes: "Two containers, one set. Follow the supplier's instructions for use for dismantling; count against the supplier's list on receipt and on return.",
    items: [
      ["Acetabular reamer handle", 1],
      ["Acetabular reamer heads 44–60 mm (in rack)", 9],
      ["Femoral broach handle", 1],
      ["Femoral broaches sizes 1–8 (in rack)", 8],
      ["Cement removal osteotome set", 1],
      ["Extraction hook, femoral", 1],
      ["Slap hammer with adapters", 1],
      ["Trial heads 28 mm, S/M/L", 3],
      ["Cup impactor with alignment guide", 1],
      ["Flexible reamer shaft, cannulated", 1],
    ],
    ifu: true,
  },
  {
    code: "ORTH-LN-KNEE-01",
    name: "Loaner total knee instruments",
    setClass: "loaner_set",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "ultrasonic"],
    weightKg: 10.6,
    sizeStu: 2,
    notes: "Cutting blocks have removable parts: see the instructions for use. Return to the supplier within 48 hours of the procedure.",
    items: [
      ["Femoral cutting block, sizes 2–6", 5],
      ["Tibial cutting guide with stylus", 1],
      ["Intramedullary alignment rod", 1],
      ["Tibial trial plates, sizes 2–6", 5],
      ["Tibial insert trials 10–16 mm", 4],
      ["Femoral impactor", 1],
      ["Pin driver, quick connect", 1],
      ["Headed pins 3.2 mm", 6],
      ["Pin extractor", 1],
    ],
    ifu: true,
  },
  {
    code: "ORTH-LN-SPN-01",
    name: "Loaner spinal fixation instruments",
    setClass: "loaner_set",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 9.8,
    sizeStu: 2,
    notes: "Awaiting the supplier's instructions for use; do not book until they are filed.",
    items: [
      ["Pedicle awl, cannulated", 1],
      ["Pedicle probe, curved", 1],
      ["Screw taps 5.5 and 6.5 mm", 2],
      ["Polyaxial screwdriver", 2],
      ["Rod bender", 1],
      ["Rod holder", 1],
      ["Compressor", 1],
      ["Distractor", 1],
      ["Final tightening driver with counter-torque", 1],
    ],
  },
  // Gynaecology and obstetrics
  {
    code: "GYN-MAJ-01",
    name: "Abdominal hysterectomy set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 8.7,
    sizeStu: 1,
    items: kit(GENERAL, GYNAE, [["Self-retaining retractor, Balfour with centre blade", 1], ["Deaver retractor 38 mm", 1]]),
  },
  {
    code: "GYN-DC-01",
    name: "Dilatation and curettage set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.9,
    sizeStu: 0.5,
    items: [
      ["Vaginal speculum, Sims medium", 1],
      ["Vulsellum forceps, 4-tooth 250 mm", 1],
      ["Uterine sound, malleable", 1],
      ["Uterine dilators, Hegar set 3–12 mm", 1],
      ["Uterine curette, sharp 6 mm", 1],
      ["Uterine curette, blunt 8 mm", 1],
      ["Polyp forceps 250 mm", 1],
      ["Sponge-holding forceps, Rampley 240 mm", 1],
      ["Gallipot 60 ml", 1],
    ],
  },
  {
    code: "GYN-CS-01",
    name: "Caesarean section set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 7.2,
    sizeStu: 1,
    notes: "Kept ready at all times: two sets in the maternity theatre store.",
    items: kit(GENERAL, [
      ["Doyen retractor, bladder blade", 1],
      ["Green-Armytage haemostatic forceps", 6],
      ["Obstetric forceps, short (pair)", 1],
      ["Cord clamp forceps", 2],
    ]),
  },
  {
    code: "GYN-HYS-01",
    name: "Hysteroscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 3.1,
    sizeStu: 0.5,
    notes: "Flush both channels of the operating sheath.",
    items: [
      ["Hysteroscope 4 mm 30°, autoclavable", 1],
      ["Operating sheath with two stopcocks", 1],
      ["Obturator for operating sheath", 1],
      ["Grasping forceps, semi-rigid 5 Fr", 1],
      ["Biopsy forceps, semi-rigid 5 Fr", 1],
      ["Scissors, semi-rigid 5 Fr", 1],
      ["Uterine dilators, Hegar set 3–12 mm", 1],
      ["Vulsellum forceps, 4-tooth 250 mm", 1],
    ],
  },
  {
    code: "GYN-VAG-01",
    name: "Vaginal repair set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.6,
    sizeStu: 0.5,
    items: kit(MINOR, [["Vaginal speculum, Auvard weighted", 1], ["Tissue forceps, Allis 150 mm", 4], ["Needle holder, Mayo-Hegar 200 mm", 1], ["Mayo scissors, curved 170 mm", 1]]),
  },
  {
    code: "GYN-COL-01",
    name: "Colposcopy instruments",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.1,
    sizeStu: 0.25,
    items: [
      ["Vaginal speculum, Cusco medium", 2],
      ["Vaginal speculum, Cusco large", 1],
      ["Cervical biopsy punch, 3 mm bite", 1],
      ["Endocervical speculum", 1],
      ["Sponge-holding forceps, Rampley 240 mm", 1],
    ],
  },
  // Ear, nose and throat
  {
    code: "ENT-TON-01",
    name: "Tonsillectomy set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.8,
    sizeStu: 0.5,
    items: [
      ["Mouth gag, Boyle-Davis with blades 2, 3, 4", 1],
      ["Draffin rods (pair)", 1],
      ["Tonsil dissector and pillar retractor", 1],
      ["Tonsil holding forceps, Denis Browne", 1],
      ["Tonsil artery forceps, Negus", 4],
      ["Tonsil snare, Eves", 1],
      ["Tonsil scissors, curved", 1],
      ["Suction tube, Yankauer", 1],
    ],
  },
  {
    code: "ENT-NAS-01",
    name: "Nasal surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush"],
    weightKg: 2.1,
    sizeStu: 0.5,
    items: kit(ENT, [
      ["Septal elevator, Freer double-ended", 1],
      ["Cottle elevator", 1],
      ["Septum forceps, Jansen-Middleton", 1],
      ["Nasal scissors, angled", 1],
      ["Scalpel handle No. 7", 1],
    ]),
  },
  {
    code: "ENT-EAR-01",
    name: "Middle ear micro set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["ultrasonic", "lumens_to_flush"],
    weightKg: 1.6,
    sizeStu: 0.5,
    notes: "Micro instruments: keep the tips in their silicone mat; flush the micro suction tubes.",
    items: [
      ["Ear speculum set, 4 sizes", 1],
      ["Micro suction tubes 18–24 G", 4],
      ["Micro ear forceps, cup 0.6 mm", 1],
      ["Micro ear scissors, Bellucci", 1],
      ["Round knife, micro", 1],
      ["Sickle knife, micro", 1],
      ["Pick, 45° micro", 1],
      ["Self-retaining mastoid retractor", 1],
    ],
  },
  {
    code: "ENT-SIN-01",
    name: "Sinus endoscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["lumens_to_flush", "dismantle"],
    weightKg: 2.9,
    sizeStu: 0.5,
    items: [
      ["Sinuscope 4 mm 0°, autoclavable", 1],
      ["Sinuscope 4 mm 30°, autoclavable", 1],
      ["Nasal forceps, Blakesley straight", 1],
      ["Nasal forceps, Blakesley 45° up", 1],
      ["Back-biting forceps", 1],
      ["Sinus seeker, double-ended", 1],
      ["Suction tube, curved sinus", 2],
      ["Freer elevator with suction", 1],
    ],
  },
  {
    code: "ENT-TRA-01",
    name: "Tracheostomy set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.3,
    sizeStu: 0.5,
    items: kit(MINOR, [["Tracheal dilator, Trousseau", 1], ["Tracheal hook, sharp", 1], ["Cricoid hook", 1], ["Langenbeck retractor 220 mm", 2]]),
  },
  // Ophthalmic
  {
    code: "OPH-CAT-01",
    name: "Cataract set",
    setClass: "specialist_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush", "manual_wash_only"],
    weightKg: 0.9,
    sizeStu: 0.25,
    notes: "Rinse cannulas and the irrigation-aspiration handpiece with sterile water; no detergent residue may remain.",
    items: kit(MICRO_EYE, [
      ["Capsulorhexis forceps, Utrata", 1],
      ["Phaco chopper", 1],
      ["Lens hook, Sinskey", 1],
      ["Irrigation-aspiration handpiece", 1],
      ["Hydrodissection cannula 27 G", 2],
      ["Lens folding forceps", 1],
    ]),
  },
  {
    code: "OPH-VIT-01",
    name: "Vitrectomy supplement",
    setClass: "specialist_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush", "manual_wash_only"],
    weightKg: 0.8,
    sizeStu: 0.25,
    items: [
      ["Scleral depressor", 1],
      ["Vitreoretinal scissors, curved", 1],
      ["End-gripping forceps, micro", 1],
      ["Flute needle handle", 1],
      ["Trocar cannula inserter", 1],
      ["Plug forceps", 1],
    ],
  },
  {
    code: "OPH-LID-01",
    name: "Eyelid surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.2,
    sizeStu: 0.25,
    items: kit(MICRO_EYE, [["Chalazion clamp, medium", 1], ["Lid plate, Jaeger", 1], ["Micro scalpel handle, round", 1], ["Castroviejo calipers", 1]]),
  },
  {
    code: "OPH-STR-01",
    name: "Strabismus set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.0,
    sizeStu: 0.25,
    items: kit(MICRO_EYE, [["Muscle hook, Jameson", 2], ["Muscle hook, Chavasse", 1], ["Castroviejo calipers", 1], ["Serrefine clamp", 2]]),
  },
  {
    code: "OPH-CHZ-01",
    name: "Chalazion set",
    setClass: "basic_tray",
    packaging: "single_pouch",
    method: "steam_134",
    weightKg: 0.3,
    sizeStu: 0.1,
    items: [
      ["Chalazion clamp, medium", 1],
      ["Chalazion curette, size 2", 1],
      ["Micro scalpel handle, round", 1],
      ["Iris scissors, curved 115 mm", 1],
    ],
  },
  // Laparoscopic surgery
  {
    code: "LAP-BAS-01",
    name: "Basic laparoscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 4.6,
    sizeStu: 1,
    notes: "Take every instrument apart (insert, shaft, handle); flush shafts through the flushing port.",
    items: kit(LAPAROSCOPY, [["Scalpel handle No. 3", 1], ["Langenbeck retractor 220 mm", 2], ["Needle holder, Mayo-Hegar 160 mm", 1]]),
  },
  {
    code: "LAP-CHO-01",
    name: "Laparoscopic cholecystectomy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 5.3,
    sizeStu: 1,
    items: kit(LAPAROSCOPY, [
      ["Clip applier 10 mm, reusable", 1],
      ["Grasping forceps, toothed 10 mm", 1],
      ["Retrieval forceps, claw 10 mm", 1],
      ["Fan retractor 10 mm", 1],
    ]),
  },
  {
    code: "LAP-SCP-01",
    name: "Laparoscope 10 mm 30° (heat-sensitive)",
    setClass: "single_instrument",
    packaging: "double_pouch",
    method: "low_temperature",
    flags: ["manual_wash_only"],
    weightKg: 0.45,
    sizeStu: 0.1,
    notes: "Not for steam. Low-temperature process only, as the instructions for use say.",
    items: [["Laparoscope 10 mm 30°, heat-sensitive", 1]],
    ifu: true,
  },
  {
    code: "LAP-SCP-02",
    name: "Laparoscope 5 mm 0°",
    setClass: "single_instrument",
    packaging: "double_pouch",
    method: "steam_134",
    flags: ["manual_wash_only"],
    weightKg: 0.3,
    sizeStu: 0.1,
    items: [["Laparoscope 5 mm 0°, autoclavable", 1]],
  },
];

const OTTERWICK: DemoSetType[] = [
  { code: "DS-MIN-01", name: "Minor operations set", setClass: "basic_tray", packaging: "wrap", method: "steam_134", weightKg: 1.85, sizeStu: 0.5, items: kit(MINOR) },
  {
    code: "DS-MIN-02",
    name: "Minor operations set, fine",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.4,
    sizeStu: 0.25,
    items: kit(MINOR, [["Tenotomy scissors, curved 115 mm", 1], ["Dissecting forceps, fine non-toothed 115 mm", 1]]),
  },
  {
    code: "DS-HER-01",
    name: "Day-case hernia set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 3.0,
    sizeStu: 0.5,
    items: kit(MINOR, [["Langenbeck retractor 220 mm", 2], ["Self-retaining retractor, West 135 mm", 1], ["Tissue forceps, Allis 150 mm", 2]]),
  },
  {
    code: "DS-VV-01",
    name: "Varicose vein set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.5,
    sizeStu: 0.5,
    items: kit(MINOR, [["Vein hook, Oesch", 2], ["Phlebectomy hook set", 1], ["Vein stripper handle with olives", 1], ["Self-retaining retractor, Weitlaner 110 mm", 1]]),
  },
  {
    code: "DS-CTR-01",
    name: "Carpal tunnel set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.7,
    sizeStu: 0.25,
    items: kit(MINOR, [["Self-retaining retractor, Weitlaner 110 mm", 1], ["Tenotomy scissors, curved 115 mm", 1], ["McDonald dissector", 1]]),
  },
  {
    code: "DS-ARTH-01",
    name: "Knee arthroscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 4.2,
    sizeStu: 1,
    items: [
      ["Arthroscope sheath 5.5 mm with two stopcocks", 1],
      ["Blunt obturator 5.5 mm", 1],
      ["Probe, 90° hook 3 mm", 1],
      ["Basket punch, straight 3.4 mm", 1],
      ["Grasping forceps, 3.4 mm", 1],
      ["Scalpel handle No. 3", 1],
    ],
  },
  {
    code: "DS-ARTH-02",
    name: "Shoulder arthroscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 4.8,
    sizeStu: 1,
    items: [
      ["Arthroscope sheath 5.5 mm with two stopcocks", 1],
      ["Blunt obturator 5.5 mm", 1],
      ["Switching stick", 2],
      ["Suture retriever", 1],
      ["Knot pusher", 1],
      ["Cannula 8 mm, threaded", 2],
      ["Probe, 90° hook 3 mm", 1],
    ],
  },
  {
    code: "DS-LN-SHV-01",
    name: "Loaner arthroscopic shaver handpiece",
    setClass: "loaner_set",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["manual_wash_only", "lumens_to_flush"],
    weightKg: 2.2,
    sizeStu: 0.5,
    notes: "Supplier's handpiece on loan: hand wash only, flush the suction channel, no ultrasonic bath.",
    items: [
      ["Shaver handpiece with cable", 1],
      ["Suction channel cleaning brush", 1],
      ["Handpiece storage insert", 1],
    ],
    ifu: true,
  },
  {
    code: "DS-CYS-01",
    name: "Rigid cystoscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 2.6,
    sizeStu: 0.5,
    items: [
      ["Cystoscope 4 mm 30°, autoclavable", 1],
      ["Cystoscope sheath 21 Fr", 1],
      ["Obturator 21 Fr", 1],
      ["Bridge, two channels", 1],
      ["Biopsy forceps, flexible 5 Fr", 1],
      ["Meatal dilators (set of 6)", 1],
    ],
  },
  {
    code: "DS-HYS-01",
    name: "Outpatient hysteroscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["lumens_to_flush"],
    weightKg: 1.9,
    sizeStu: 0.5,
    items: [
      ["Hysteroscope 2.9 mm 30°, autoclavable", 1],
      ["Single-flow sheath", 1],
      ["Vaginal speculum, Cusco medium", 1],
      ["Tenaculum, single tooth", 1],
      ["Uterine sound, malleable", 1],
    ],
  },
  {
    code: "DS-DC-01",
    name: "Dilatation and curettage set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.8,
    sizeStu: 0.5,
    items: [
      ["Vaginal speculum, Sims medium", 1],
      ["Vulsellum forceps, 4-tooth 250 mm", 1],
      ["Uterine sound, malleable", 1],
      ["Uterine dilators, Hegar set 3–12 mm", 1],
      ["Uterine curette, sharp 6 mm", 1],
      ["Polyp forceps 250 mm", 1],
    ],
  },
  {
    code: "DS-CAT-01",
    name: "Cataract set A",
    setClass: "specialist_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush", "manual_wash_only"],
    weightKg: 0.9,
    sizeStu: 0.25,
    items: kit(MICRO_EYE, [["Capsulorhexis forceps, Utrata", 1], ["Phaco chopper", 1], ["Hydrodissection cannula 27 G", 2]]),
  },
  {
    code: "DS-CAT-02",
    name: "Cataract set B",
    setClass: "specialist_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush", "manual_wash_only"],
    weightKg: 0.9,
    sizeStu: 0.25,
    items: kit(MICRO_EYE, [["Capsulorhexis forceps, Utrata", 1], ["Lens hook, Sinskey", 1], ["Hydrodissection cannula 27 G", 2]]),
  },
  {
    code: "DS-GRO-01",
    name: "Grommet insertion set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush"],
    weightKg: 0.6,
    sizeStu: 0.25,
    items: [
      ["Ear speculum set, 4 sizes", 1],
      ["Myringotomy knife handle", 1],
      ["Crocodile forceps, micro", 1],
      ["Micro suction tubes 18–24 G", 3],
      ["Grommet introducer", 1],
    ],
  },
  {
    code: "DS-TON-01",
    name: "Tonsillectomy set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.7,
    sizeStu: 0.5,
    items: [
      ["Mouth gag, Boyle-Davis with blades 2, 3, 4", 1],
      ["Tonsil dissector and pillar retractor", 1],
      ["Tonsil holding forceps, Denis Browne", 1],
      ["Tonsil artery forceps, Negus", 4],
      ["Suction tube, Yankauer", 1],
    ],
  },
  {
    code: "DS-SEP-01",
    name: "Nasal septum set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush"],
    weightKg: 1.9,
    sizeStu: 0.5,
    items: kit(ENT, [["Septal elevator, Freer double-ended", 1], ["Septum forceps, Jansen-Middleton", 1], ["Scalpel handle No. 7", 1]]),
  },
  {
    code: "DS-SKN-01",
    name: "Skin lesion excision set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.3,
    sizeStu: 0.25,
    items: kit(MINOR, [["Biopsy punch handle", 1]]),
  },
  {
    code: "DS-TOE-01",
    name: "Toenail surgery set",
    setClass: "basic_tray",
    packaging: "single_pouch",
    method: "steam_134",
    weightKg: 0.5,
    sizeStu: 0.1,
    items: [
      ["Nail elevator, Freer", 1],
      ["Nail splitter, English anvil", 1],
      ["Artery forceps, Halsted mosquito straight 125 mm", 2],
      ["Bone curette, Volkmann size 2", 1],
    ],
  },
  {
    code: "DS-LAP-01",
    name: "Diagnostic laparoscopy set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "lumens_to_flush"],
    weightKg: 3.8,
    sizeStu: 1,
    items: kit(LAPAROSCOPY, [["Uterine manipulator, reusable", 1]]),
  },
  {
    code: "DS-SCP-01",
    name: "Laparoscope 5 mm 30°",
    setClass: "single_instrument",
    packaging: "double_pouch",
    method: "steam_134",
    flags: ["manual_wash_only"],
    weightKg: 0.3,
    sizeStu: 0.1,
    items: [["Laparoscope 5 mm 30°, autoclavable", 1]],
  },
  {
    code: "DS-SCP-02",
    name: "Arthroscope 4 mm 30°",
    setClass: "single_instrument",
    packaging: "double_pouch",
    method: "steam_134",
    flags: ["manual_wash_only"],
    weightKg: 0.35,
    sizeStu: 0.1,
    items: [["Arthroscope 4 mm 30°, autoclavable", 1]],
  },
  {
    code: "DS-VAS-01",
    name: "Vasectomy set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 0.9,
    sizeStu: 0.25,
    items: [
      ["Ring forceps, vas fixation", 1],
      ["Dissecting forceps, sharp curved", 1],
      ["Artery forceps, Halsted mosquito curved 125 mm", 2],
      ["Iris scissors, curved 115 mm", 1],
      ["Needle holder, Mayo-Hegar 140 mm", 1],
    ],
  },
  {
    code: "DS-CIR-01",
    name: "Circumcision set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.4,
    sizeStu: 0.25,
    items: kit(MINOR, [["Artery forceps, Spencer Wells straight 160 mm", 2], ["Probe, malleable 150 mm", 1]]),
  },
  {
    code: "DS-HAN-01",
    name: "Hand minor set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.5,
    sizeStu: 0.25,
    items: kit(MINOR, [["Senn retractor, double-ended", 2], ["Tenotomy scissors, curved 115 mm", 1]]),
  },
  {
    code: "DS-SUT-01",
    name: "Suture set",
    setClass: "basic_tray",
    packaging: "single_pouch",
    method: "steam_134",
    weightKg: 0.25,
    sizeStu: 0.1,
    items: [
      ["Needle holder, Mayo-Hegar 140 mm", 1],
      ["Dissecting forceps, toothed 115 mm", 1],
      ["Suture scissors, straight 130 mm", 1],
    ],
  },
];

const cassette = (code: string, name: string, items: readonly Line[], weightKg: number, notes?: string, flags: ProcessingFlag[] = ["ultrasonic"]): DemoSetType => ({
  code,
  name,
  setClass: "dental_cassette",
  packaging: "wrap",
  method: "steam_134",
  flags,
  weightKg,
  sizeStu: weightKg > 1.2 ? 0.25 : 0.1,
  notes,
  items,
});

const pouched = (code: string, name: string, item: string, weightKg: number, packaging: Packaging = "single_pouch", flags: ProcessingFlag[] = [], notes?: string): DemoSetType => ({
  code,
  name,
  setClass: "single_instrument",
  packaging,
  method: "steam_134",
  flags,
  weightKg,
  sizeStu: 0.05,
  notes,
  items: [[item, 1]],
});

const MARROWGATE: DemoSetType[] = [
  cassette("DEN-EXAM-01", "Examination cassette", kit(DENTAL_EXAM), 0.6),
  cassette(
    "DEN-REST-01",
    "Restorative cassette",
    kit(DENTAL_EXAM, [
      ["Excavator, double-ended small", 1],
      ["Flat plastic instrument", 1],
      ["Amalgam carrier", 1],
      ["Amalgam plugger, double-ended", 1],
      ["Ball burnisher", 1],
      ["Matrix retainer", 1],
    ]),
    0.9,
  ),
  cassette(
    "DEN-REST-02",
    "Composite restorative cassette",
    kit(DENTAL_EXAM, [
      ["Composite placement instrument, non-stick", 2],
      ["Excavator, double-ended small", 1],
      ["Matrix ring forceps", 1],
      ["Articulating paper holder", 1],
    ]),
    0.85,
  ),
  cassette(
    "DEN-HYG-01",
    "Hygiene and scaling cassette",
    kit(DENTAL_EXAM, [
      ["Sickle scaler, anterior", 1],
      ["Sickle scaler, posterior", 1],
      ["Universal curette", 2],
      ["Area-specific curette 11/12", 1],
      ["Area-specific curette 13/14", 1],
    ]),
    0.8,
  ),
  cassette(
    "DEN-PERIO-01",
    "Periodontal surgery cassette",
    kit(DENTAL_EXAM, [
      ["Scalpel handle, round", 1],
      ["Periosteal elevator, Molt 9", 1],
      ["Periodontal knife, Kirkland", 1],
      ["Tissue forceps, Adson 120 mm", 1],
      ["Needle holder, Castroviejo 140 mm", 1],
      ["Suture scissors, curved 120 mm", 1],
    ]),
    1.3,
  ),
  cassette(
    "DEN-ENDO-01",
    "Endodontic cassette",
    kit(DENTAL_EXAM, [
      ["Endodontic explorer DG16", 1],
      ["Spreader, finger", 2],
      ["Plugger, Machtou set", 1],
      ["Endodontic ruler and file stand", 1],
      ["Locking tweezers", 1],
    ]),
    0.95,
    "Files are single use and never go in the cassette.",
  ),
  cassette(
    "DEN-EXT-01",
    "Extraction cassette, upper",
    kit(DENTAL_EXAM, [
      ["Extraction forceps, upper universal", 1],
      ["Extraction forceps, upper molars left", 1],
      ["Extraction forceps, upper molars right", 1],
      ["Straight elevator 3 mm", 1],
      ["Luxator 3 mm", 1],
    ]),
    1.45,
  ),
  cassette(
    "DEN-EXT-02",
    "Extraction cassette, lower",
    kit(DENTAL_EXAM, [
      ["Extraction forceps, lower universal", 1],
      ["Extraction forceps, lower molars", 1],
      ["Straight elevator 3 mm", 1],
      ["Cryer elevators (pair)", 1],
    ]),
    1.35,
  ),
  cassette(
    "DEN-SURG-01",
    "Oral surgery cassette",
    kit(DENTAL_EXAM, [
      ["Scalpel handle, round", 1],
      ["Periosteal elevator, Molt 9", 1],
      ["Cheek retractor, double-ended", 1],
      ["Bone rongeur, fine curved 150 mm", 1],
      ["Surgical curette, Lucas", 1],
      ["Needle holder, Mayo-Hegar 140 mm", 1],
      ["Suture scissors, curved 120 mm", 1],
    ]),
    1.6,
  ),
  {
    code: "DEN-IMP-01",
    name: "Implant surgery kit",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["ultrasonic", "lumens_to_flush", "dismantle"],
    weightKg: 1.9,
    sizeStu: 0.25,
    notes: "Internally irrigated drills: flush each channel. Return every drill to its marked place in the tray.",
    items: [
      ["Pilot drill 2.0 mm", 1],
      ["Twist drill 2.8 mm", 1],
      ["Twist drill 3.5 mm", 1],
      ["Countersink drill", 1],
      ["Depth gauge", 1],
      ["Parallel pins", 4],
      ["Torque ratchet with adapter", 1],
      ["Hex driver, short and long", 2],
      ["Drill extension", 1],
      ["Surgical tray with lid", 1],
    ],
    ifu: true,
  },
  cassette(
    "DEN-ORTHO-01",
    "Orthodontic pliers cassette",
    [
      ["Band-removing pliers", 1],
      ["Distal end cutter", 1],
      ["Ligature cutter", 1],
      ["Bird-beak pliers", 1],
      ["Weingart pliers", 1],
      ["Ligature director", 1],
    ],
    1.1,
    "Open every plier before washing; oil the joints after drying.",
  ),
  cassette(
    "DEN-CROWN-01",
    "Crown and bridge cassette",
    kit(DENTAL_EXAM, [
      ["Crown remover, slide hammer", 1],
      ["Cord packer, serrated", 2],
      ["Crown scissors, curved", 1],
      ["Cement spatula", 1],
    ]),
    0.9,
  ),
  cassette(
    "DEN-DAM-01",
    "Rubber dam kit",
    [
      ["Rubber dam punch", 1],
      ["Rubber dam clamp forceps", 1],
      ["Rubber dam frame", 1],
      ["Rubber dam clamps, assorted", 8],
    ],
    0.7,
  ),
  pouched(
    "DEN-HP-01",
    "High-speed handpiece",
    "High-speed turbine handpiece",
    0.08,
    "single_pouch",
    ["lumens_to_flush", "manual_wash_only"],
    "Flush the spray channels and lubricate before packing, as the instructions for use say.",
  ),
  pouched("DEN-HP-02", "Slow-speed contra-angle handpiece", "Contra-angle handpiece 1:1", 0.09, "single_pouch", ["lumens_to_flush", "manual_wash_only"], "Lubricate before packing."),
  pouched("DEN-FORC-01", "Extraction forceps, upper molars", "Extraction forceps, upper molars right", 0.12),
  pouched("DEN-FORC-02", "Extraction forceps, lower molars", "Extraction forceps, lower molars", 0.12),
  pouched("DEN-ELEV-01", "Straight elevator", "Straight elevator 3 mm", 0.05),
  pouched("DEN-MIR-01", "Mouth mirror handle", "Mouth mirror handle with mirror head No. 4", 0.03),
  pouched("DEN-SCL-01", "Ultrasonic scaler insert", "Scaler insert, universal tip", 0.04, "double_pouch"),
];

const PELLOWFIELD: DemoSetType[] = [
  {
    code: "VET-SPAY-01",
    name: "Spay set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.7,
    sizeStu: 0.5,
    items: kit(VET_SOFT, [["Spay hook, Snook", 1], ["Artery forceps, Carmalt 160 mm", 3]]),
  },
  {
    code: "VET-CAST-01",
    name: "Castration set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 1.2,
    sizeStu: 0.25,
    items: kit(VET_SOFT, [["Artery forceps, Carmalt 160 mm", 2]]),
  },
  { code: "VET-GEN-01", name: "General soft tissue set", setClass: "basic_tray", packaging: "wrap", method: "steam_134", weightKg: 1.9, sizeStu: 0.5, items: kit(VET_SOFT, [["Senn retractor, double-ended", 2]]) },
  {
    code: "VET-GEN-02",
    name: "General soft tissue set, large dog",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 5.4,
    sizeStu: 1,
    items: kit(GENERAL, [["Self-retaining retractor, Balfour with centre blade", 1], ["Suction tube, Poole", 1]]),
  },
  {
    code: "VET-EXL-01",
    name: "Exploratory laparotomy set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    weightKg: 5.9,
    sizeStu: 1,
    items: kit(VET_SOFT, ABDOMINAL),
  },
  {
    code: "VET-CAES-01",
    name: "Caesarean set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 2.3,
    sizeStu: 0.5,
    notes: "Emergency set: keep one packed at all times.",
    items: kit(VET_SOFT, [["Tissue forceps, Babcock 160 mm", 2], ["Artery forceps, Carmalt 160 mm", 2]]),
  },
  {
    code: "VET-ORTH-01",
    name: "Orthopaedic set",
    setClass: "major_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["ultrasonic"],
    weightKg: 7.2,
    sizeStu: 1,
    items: kit(VET_SOFT, ORTHO),
  },
  {
    code: "VET-LN-TPLO-01",
    name: "Loaner tibial osteotomy plating instruments",
    setClass: "loaner_set",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["dismantle", "ultrasonic", "lumens_to_flush"],
    weightKg: 6.4,
    sizeStu: 1,
    notes: "Supplier's set on loan: check against the supplier's list on receipt and before return.",
    items: [
      ["Radial saw blade holder", 1],
      ["Jig with locking pins", 1],
      ["Drill guide, locking 2.7/3.5 mm", 2],
      ["Drill bit 2.0 mm, quick coupling", 2],
      ["Drill bit 2.5 mm, quick coupling", 2],
      ["Depth gauge for screws to 60 mm", 1],
      ["Hexagonal screwdriver 2.5 mm", 1],
      ["Rotation measuring guide", 1],
    ],
    ifu: true,
  },
  {
    code: "VET-DRILL-01",
    name: "Battery drill set",
    setClass: "specialist_tray",
    packaging: "rigid_container",
    method: "steam_134",
    flags: ["manual_wash_only"],
    weightKg: 3.2,
    sizeStu: 0.5,
    notes: "The battery is cleaned by wipe and never sterilised.",
    items: [
      ["Battery drill handpiece", 1],
      ["Keyless chuck attachment", 1],
      ["Wire driver attachment", 1],
      ["Battery transfer shield", 1],
    ],
  },
  {
    code: "VET-DENT-01",
    name: "Veterinary dental set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["ultrasonic"],
    weightKg: 1.1,
    sizeStu: 0.25,
    items: [
      ["Dental probe, double-ended", 1],
      ["Periodontal probe, graduated", 1],
      ["Sickle scaler, posterior", 1],
      ["Luxator 3 mm", 1],
      ["Luxator 5 mm", 1],
      ["Extraction forceps, small breed", 1],
      ["Root tip pick", 1],
    ],
  },
  {
    code: "VET-EYE-01",
    name: "Eyelid surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 0.8,
    sizeStu: 0.25,
    items: kit(MICRO_EYE, [["Lid plate, Jaeger", 1]]),
  },
  {
    code: "VET-AUR-01",
    name: "Aural surgery set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: ["lumens_to_flush"],
    weightKg: 1.5,
    sizeStu: 0.25,
    items: kit(VET_SOFT, [["Self-retaining retractor, Gelpi 140 mm", 1], ["Suction tube, Frazier 8 Ch", 1]]),
  },
  {
    code: "VET-LAC-01",
    name: "Laceration repair set",
    setClass: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    weightKg: 0.9,
    sizeStu: 0.25,
    items: [
      ["Needle holder, Mayo-Hegar 140 mm", 1],
      ["Adson-Brown forceps 120 mm", 1],
      ["Mayo scissors, curved 145 mm", 1],
      ["Artery forceps, Halsted mosquito curved 125 mm", 2],
      ["Suture scissors, straight 130 mm", 1],
    ],
  },
  {
    code: "VET-BIOP-01",
    name: "Biopsy set",
    setClass: "basic_tray",
    packaging: "single_pouch",
    method: "steam_134",
    weightKg: 0.4,
    sizeStu: 0.1,
    items: [
      ["Biopsy punch handle", 1],
      ["Scalpel handle No. 3", 1],
      ["Dissecting forceps, toothed 115 mm", 1],
      ["Iris scissors, curved 115 mm", 1],
    ],
  },
  {
    code: "VET-DEW-01",
    name: "Dewclaw and minor set",
    setClass: "basic_tray",
    packaging: "single_pouch",
    method: "steam_134",
    weightKg: 0.5,
    sizeStu: 0.1,
    items: [
      ["Scalpel handle No. 3", 1],
      ["Artery forceps, Halsted mosquito curved 125 mm", 2],
      ["Mayo scissors, curved 145 mm", 1],
      ["Needle holder, Mayo-Hegar 140 mm", 1],
    ],
  },
];

export const DEMO_CATALOGUES: Record<string, DemoSetType[]> = {
  QMH: QUILLBY,
  ODS: OTTERWICK,
  MDP: MARROWGATE,
  PVC: PELLOWFIELD,
};

// ---------------------------------------------------------------------------------------------
// Instructions-for-use PDFs

/** Fixed, so that the PDF's dates and file id (derived from them) are the same on every run. */
const IFU_DATE = new Date("2026-01-12T09:00:00Z");

/** A short instructions-for-use document for a demo set type, marked as invented. */
export function renderDemoIfu(setType: DemoSetType, organisationName: string): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({
      size: "A4",
      margin: 56,
      info: {
        Title: `Instructions for use: ${setType.name}`,
        Author: "Steamlane demo",
        Subject: setType.code,
        CreationDate: IFU_DATE,
        ModDate: IFU_DATE,
      },
    });
    const chunks: Buffer[] = [];
    doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);

    doc.font("Helvetica-Bold").fontSize(18).text("Instructions for use");
    doc.moveDown(0.3).font("Helvetica").fontSize(13).text(`${setType.name} (${setType.code})`);
    doc.moveDown(0.3).fontSize(9).fillColor("#555555").text(`Filed for ${organisationName}. Demonstration document: invented for the Steamlane demo, not a manufacturer's text.`);
    doc.fillColor("#000000").moveDown(1);

    const section = (title: string, lines: string[]) => {
      doc.font("Helvetica-Bold").fontSize(11).text(title);
      doc.font("Helvetica").fontSize(10);
      for (const line of lines) doc.text(`•  ${line}`, { indent: 8 });
      doc.moveDown(0.6);
    };
    const flags = setType.flags ?? [];
    section("Contents", setType.items.map(([name, count]) => `${count} × ${name}`));
    section("Preparation at the point of use", [
      "Remove gross soil with a damp, lint-free cloth. Keep the instruments moist until processing.",
      "Return the set to the unit in its closed transport container.",
    ]);
    section("Cleaning and disinfection", [
      ...(flags.includes("dismantle") ? ["Dismantle the instruments into their parts before cleaning."] : []),
      ...(flags.includes("lumens_to_flush") ? ["Flush every lumen and channel with water before and after cleaning."] : []),
      ...(flags.includes("manual_wash_only")
        ? ["Clean by hand with a neutral or mildly alkaline detergent; do not use a washer-disinfector or an ultrasonic bath."]
        : ["Clean and thermally disinfect in a washer-disinfector (A0 3000 or as the unit's validated process sets)."]),
      ...(flags.includes("ultrasonic") ? ["Ultrasonic cleaning may be used for hinged and serrated parts."] : []),
      "Inspect under magnification; set aside anything damaged, corroded or blunt.",
    ]);
    section("Sterilisation", [
      setType.method === "low_temperature"
        ? "Low-temperature sterilisation only, in a process validated for this device. Do not steam sterilise."
        : setType.method === "steam_121"
          ? "Steam sterilisation at 121 °C with at least 15 minutes holding time."
          : "Steam sterilisation with pre-vacuum at 134 °C with at least 3 minutes holding time.",
      "Follow the unit's validated procedures; these instructions do not replace them.",
    ]);
    doc.end();
  });
}

/** Stores a PDF in the file store and records it as an "ifu" file of the organisation. */
async function storeIfu(
  trx: Transaction<Database>,
  input: { bytes: Buffer; originalName: string; organisationId: number; uploadedBy: number | null },
  now: Date,
): Promise<number> {
  const sha256 = createHash("sha256").update(input.bytes).digest("hex");
  // A key derived from the content: the same demo document always lands in the same place.
  const key = `demo/${sha256}`;
  await fileStore().put(key, input.bytes, "application/pdf", { replace: true });
  const { id } = await trx
    .insertInto("files")
    .values({
      organisation_id: input.organisationId,
      purpose: "ifu",
      original_name: input.originalName,
      content_type: "application/pdf",
      size_bytes: input.bytes.length,
      sha256,
      storage_key: key,
      uploaded_by: input.uploadedBy,
      created_at: now.toISOString(),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return id;
}

/** Writes every customer's catalogue; returns the set type ids by organisation code and set type code. */
export async function seedCatalogue(
  trx: Transaction<Database>,
  result: SeedResult,
  now: Date,
): Promise<Record<string, Record<string, number>>> {
  const iso = now.toISOString();
  const uploadedBy = result.users["admin@larkmoor.example"] ?? null;
  const ids: Record<string, Record<string, number>> = {};
  for (const [orgCode, setTypes] of Object.entries(DEMO_CATALOGUES)) {
    const organisationId = result.organisations[orgCode];
    if (organisationId === undefined) throw new Error(`The demo catalogue names an unknown organisation ${orgCode}.`);
    const org = await trx.selectFrom("organisations").select("name").where("id", "=", organisationId).executeTakeFirstOrThrow();
    ids[orgCode] = {};
    for (const setType of setTypes) {
      const ifuFileId = setType.ifu
        ? await storeIfu(
            trx,
            { bytes: await renderDemoIfu(setType, org.name), originalName: `IFU ${setType.code}.pdf`, organisationId, uploadedBy },
            now,
          )
        : null;
      const { id } = await trx
        .insertInto("set_types")
        .values({
          organisation_id: organisationId,
          code: setType.code,
          name: setType.name,
          set_class: setType.setClass,
          packaging: setType.packaging,
          sterilisation_method: setType.method,
          processing_flags: JSON.stringify(setType.flags ?? []),
          processing_notes: setType.notes ?? null,
          weight_g: Math.round(setType.weightKg * 1000),
          size_stu: setType.sizeStu,
          ifu_file_id: ifuFileId,
          created_at: iso,
          updated_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      await trx
        .insertInto("set_type_items")
        .values(setType.items.map(([name, quantity], index) => ({ set_type_id: id, position: index + 1, name, quantity })))
        .execute();
      ids[orgCode][setType.code] = id;
    }
  }
  result.setTypes = ids;
  return ids;
}
