"""Strict XML parse of SVG documents with Python's standard library (xml.etree).

Input:  {"svgs": ["<svg ...>", ...]}
Output: {"results": [{"ok": bool, "error": str, "root": tag, "namespace": uri,
                      "counts": {local tag: count}, "texts": [text content of <text>]}]}
"""
import json
import sys
import xml.etree.ElementTree as ET

SVG_NS = "http://www.w3.org/2000/svg"


def local(tag):
    return tag.split("}", 1)[1] if tag.startswith("{") else tag


def one(svg):
    try:
        root = ET.fromstring(svg)
    except ET.ParseError as e:
        return {"ok": False, "error": str(e)}
    counts = {}
    texts = []
    for el in root.iter():
        name = local(el.tag)
        counts[name] = counts.get(name, 0) + 1
        if name == "text":
            texts.append("".join(el.itertext()))
    ns = root.tag[1:].split("}")[0] if root.tag.startswith("{") else ""
    return {"ok": True, "error": "", "root": local(root.tag), "namespace": ns,
            "counts": counts, "texts": texts}


def main():
    req = json.load(sys.stdin)
    json.dump({"results": [one(s) for s in req["svgs"]]}, sys.stdout)


if __name__ == "__main__":
    main()
