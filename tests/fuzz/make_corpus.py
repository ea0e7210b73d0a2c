#!/usr/bin/env python3
"""Writes the fuzz seed corpus (tests/fuzz/corpus/*.json): malformed case files, each a named,
deliberate mistake (wrong types, unknown keys, values out of range, broken syntax, hostile
encodings, deep nesting, huge numbers, control characters), plus a few valid invented cases for
the fuzzer to mutate. Deterministic: re-running it rewrites the same files.

    python3 tests/fuzz/make_corpus.py
"""
import copy
import json
import os

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "corpus")

VALID = {
    "schema_version": 1,
    "label": "Invented fuzz seed",
    "tooth": {"type": "maxillary_central_incisor"},
    "pdl": {"width_mm": 0.2},
    "bone": {"cortical_thickness_mm": 1.0},
    "scenarios": [
        {"name": "healthy", "horizontal_loss_mm": 0},
        {"name": "loss", "horizontal_loss_percent": 20,
         "angular_defect": {"surface": "mesial", "depth_mm": 2, "width_deg": 60}},
    ],
    "load": {"magnitude": 100, "unit": "g", "direction": "lingual",
             "couple": {"moment_to_force_mm": 8}},
    "thresholds": {"capillary": {"value_kpa": 4.7}, "limit": {"value_kpa": 16}},
    "mesh": {"preset": "coarse"},
}

cases = {}


def put(name, text):
    assert name not in cases, name
    cases[name] = text if isinstance(text, bytes) else text.encode("utf-8")


def mutated(path, value, remove=False):
    """VALID with the dotted `path` (list indices as numbers) set to `value` or removed."""
    doc = copy.deepcopy(VALID)
    node = doc
    steps = path.split(".")
    for step in steps[:-1]:
        key = int(step) if step.isdigit() else step
        if isinstance(node, dict) and key not in node:
            node[key] = {}
        node = node[key]
    last = int(steps[-1]) if steps[-1].isdigit() else steps[-1]
    if remove:
        del node[last]
    else:
        node[last] = value
    return json.dumps(doc, indent=1)


# Valid seeds (to mutate from).
put("valid_full", json.dumps(VALID, indent=1))
put("valid_minimal", json.dumps({"tooth": {"type": "mandibular_canine"}}))
put("valid_ideal_root", json.dumps({"tooth": {"idealised_root": {"shape": "cone",
                                    "radius_at_crest_mm": 3, "root_length_mm": 12}}}))
put("valid_vector_direction", mutated("load.direction", [1, 0.5, -0.2]))
put("valid_angles", mutated("load.direction", {"azimuth_deg": 200, "elevation_deg": -10}))
put("valid_moment", mutated("load.couple", {"moment": [0, 800, 0], "unit": "cN.mm"}))
put("valid_profile", mutated("pdl", {"width_profile_mm": {"crest": 0.2, "mid_root": 0.15,
                                                           "apex": 0.2}}))

# Scanned tooth surfaces (tooth.surface): every one refused before or while reading the file.
LANDMARKS = {"apex": [0, 0, -13], "crown_tip": [0, 0, 10.5], "cej_labial": [3.5, 0, 0],
             "cej_lingual": [-3.5, 0, 0], "cej_mesial": [0, 3.2, 0], "cej_distal": [0, -3.2, 0]}
put("surface_missing_file", mutated("tooth.surface", {"file": "no_such_tooth.stl",
                                                      "landmarks": LANDMARKS}))
put("surface_no_landmarks", mutated("tooth.surface", {"file": "no_such_tooth.stl"}))
put("surface_device", mutated("tooth.surface", {"file": "/dev/zero", "landmarks": LANDMARKS}))
put("surface_folder", mutated("tooth.surface", {"file": "/", "accept_principal_axes": True}))
put("surface_bad_landmark", mutated("tooth.surface", {"file": "t.stl", "landmarks": {"apex": [0, 0]}}))
put("surface_no_file", mutated("tooth.surface", {"landmarks": LANDMARKS}))
put("surface_type", mutated("tooth.surface", "tooth.stl"))

# Wrong types at every level.
type_values = {"string": "\"x\"", "array": [1, 2], "object": {"a": 1}, "null": None,
               "bool": True, "number": 3}
for path in ["schema_version", "label", "notes", "tooth", "tooth.type", "pdl", "pdl.width_mm",
             "bone", "scenarios", "scenarios.0", "scenarios.1.name", "load", "load.magnitude",
             "load.unit", "load.direction", "load.couple", "thresholds", "mesh", "mesh.preset",
             "mesh.pdl_layers", "mesh.quadratic"]:
    for kind in ["null", "array", "object", "bool"]:
        put("type_%s_%s" % (path.replace(".", "_"), kind), mutated(path, type_values[kind]))

# Unknown and misspelt keys.
for name, path in [("top", "lod"), ("tooth", "tooth.typ"), ("load", "load.magnitud"),
                   ("scenario", "scenarios.1.horizontal_los_mm"), ("mesh", "mesh.prest"),
                   ("threshold", "thresholds.limits"), ("material", "pdl.material.young")]:
    put("unknown_key_" + name, mutated(path, 1))

# Out of range values.
for name, path, value in [
        ("magnitude_negative", "load.magnitude", -5), ("magnitude_zero", "load.magnitude", 0),
        ("magnitude_huge", "load.magnitude", 1e300), ("magnitude_tiny", "load.magnitude", 1e-300),
        ("pdl_width_zero", "pdl.width_mm", 0), ("pdl_width_huge", "pdl.width_mm", 1e9),
        ("poisson_half", "pdl.material", {"poisson_ratio": 0.5}),
        ("modulus_negative", "bone.cortical_material", {"young_modulus_mpa": -1}),
        ("loss_beyond_root", "scenarios.1", {"horizontal_loss_mm": 40}),
        ("loss_percent_99", "scenarios.1", {"horizontal_loss_percent": 99.9}),
        ("loss_percent_negative", "scenarios.1", {"horizontal_loss_percent": -1}),
        ("defect_deep", "scenarios.1.angular_defect.depth_mm", 50),
        ("defect_width_zero", "scenarios.1.angular_defect.width_deg", 0),
        ("elevation_over", "load.direction", {"azimuth_deg": 0, "elevation_deg": 91}),
        ("direction_zero", "load.direction", [0, 0, 0]),
        ("direction_tiny", "load.direction", [1e-300, 0, 0]),
        ("ratio_huge", "load.couple", {"moment_to_force_mm": 1e6}),
        ("layers_huge", "mesh.pdl_layers", 999999), ("layers_overflow", "mesh.pdl_layers", 2**40),
        ("edge_tiny", "mesh.pdl_edge_mm", 1e-9), ("threshold_zero", "thresholds.limit.value_kpa", 0),
        ("threshold_order", "thresholds.capillary.value_kpa", 50),
        ("schema_new", "schema_version", 99), ("schema_negative", "schema_version", -1),
        ("bracket_high", "bracket.height_mm", 100), ("bracket_negative", "bracket.height_mm", -1),
        ("root_short", "tooth.dimensions", {"root_length_mm": 0.5}),
        ("crown_zero", "tooth.dimensions", {"crown_length_mm": 0}),
        ("taper_huge", "tooth.dimensions", {"root_taper_fullness": 1e9}),
        ("cortical_thick", "bone.cortical_thickness_mm", 30),
        ("scenarios_empty", "scenarios", []),
        ("scenarios_many", "scenarios", [{"horizontal_loss_mm": i * 0.01} for i in range(60)]),
        ("names_repeat", "scenarios.1.name", "healthy"), ("name_empty", "scenarios.1.name", ""),
        ("name_long", "scenarios.1.name", "n" * 500),
        ("couple_both", "load.couple", {"moment": [0, 1, 0], "moment_to_force_mm": 8}),
        ("couple_neither", "load.couple", {}),
        ("unit_unknown", "load.unit", "kg"), ("tooth_unknown", "tooth.type", "molar"),
        ("preset_unknown", "mesh.preset", "ultra"),
        ("movement_and_couple", "load.movement", "translation"),
        ("ideal_shape", "tooth.idealised_root", {"shape": "cube"}),
        ("surface_unknown", "scenarios.1.angular_defect.surface", "top"),
        ("vector_short", "load.direction", [1, 0]), ("vector_long", "load.direction", [1, 0, 0, 0]),
        ("vector_strings", "load.direction", ["1", "0", "0"])]:
    put("range_" + name, mutated(path, value))

# Control characters in names and labels (refused), escapes in strings.
for name, path, value in [
        ("label_newline", "label", "a\n# b"), ("label_nul", "label", "a\u0000b"),
        ("label_escape", "label", "\u001b[31m"), ("label_c1", "label", "a\u0085b"),
        ("name_cr", "scenarios.1.name", "loss\r"), ("name_tab", "scenarios.1.name", "a\tb"),
        ("source_newline", "thresholds.limit.source", "x\ny"),
        ("notes_nul", "notes", "ok\nthen\u0000"), ("label_surrogate_pair", "label", "\U0001F9B7")]:
    put("control_" + name, mutated(path, value))
put("control_lone_surrogate", mutated("label", "PLACEHOLDER").replace("PLACEHOLDER", "\\ud800"))
put("control_bad_escape", mutated("label", "PLACEHOLDER").replace("PLACEHOLDER", "\\x41"))

# Broken syntax and hostile encodings.
text = json.dumps(VALID)
put("syntax_truncated_half", text[: len(text) // 2])
put("syntax_truncated_end", text[:-1])
put("syntax_missing_comma", text.replace(", \"tooth\"", " \"tooth\"", 1))
put("syntax_trailing_comma", text[:-1] + ",}")
put("syntax_single_quotes", text.replace("\"", "'"))
put("syntax_comment", "// comment\n" + text)
put("syntax_two_documents", text + text)
put("syntax_empty", "")
put("syntax_whitespace", " \n\t ")
put("syntax_bare_value", "42")
put("syntax_array_top", "[" + text + "]")
put("syntax_duplicate_key", "{\"label\": \"a\", \"label\": \"b\"}")
put("syntax_nan", mutated("load.magnitude", 1).replace("\"magnitude\": 1", "\"magnitude\": NaN"))
put("syntax_infinity", mutated("load.magnitude", 1).replace("\"magnitude\": 1", "\"magnitude\": Infinity"))
put("number_overflow", mutated("load.magnitude", 1).replace("\"magnitude\": 1", "\"magnitude\": 1e400"))
put("number_overflow_negative", mutated("pdl.width_mm", 1).replace("\"width_mm\": 1", "\"width_mm\": -1e999"))
put("number_underflow", mutated("pdl.width_mm", 1).replace("\"width_mm\": 1", "\"width_mm\": 1e-400"))
put("number_long_integer", mutated("schema_version", 1).replace("\"schema_version\": 1", "\"schema_version\": " + "9" * 400))
put("number_leading_zero", "{\"schema_version\": 01}")
put("number_hex", "{\"schema_version\": 0x1}")
put("utf8_bom", b"\xef\xbb\xbf" + text.encode())
put("utf8_invalid", text.encode().replace(b"Invented", b"Inv\xff\xfented"))
put("utf8_overlong", text.encode().replace(b"Invented", b"Inv\xc0\xafented"))
put("utf16", text.encode("utf-16"))
put("raw_nul_byte", text.encode().replace(b"Invented", b"Inv\x00ented"))
put("raw_newline_in_string", text.replace("Invented fuzz seed", "Invented\nfuzz seed"))
put("deep_arrays", "{\"notes\": " + "[" * 70 + "]" * 70 + "}")
put("deep_objects", "{\"a\":" * 70 + "1" + "}" * 70)
put("deep_unclosed", "[" * 5000)
put("deep_at_limit", "{\"notes\": " + "[" * 63 + "]" * 63 + "}")
put("brackets_in_string", mutated("notes", "[[[[{{{{" * 20))
put("long_string", mutated("notes", "x" * 20000))
put("long_key", mutated("k" * 5000, 1))
put("many_keys", json.dumps({"k%d" % i: i for i in range(2000)}))

os.makedirs(OUT, exist_ok=True)
for old in os.listdir(OUT):
    os.remove(os.path.join(OUT, old))
for name, data in sorted(cases.items()):
    with open(os.path.join(OUT, name + ".json"), "wb") as f:
        f.write(data)
print("wrote %d seed files to %s" % (len(cases), OUT))
