"""Makes wrackline's invented demo records and demo photos.

Everything here is invented: the recording network, the observers, the finds. The
coastline is real (Cardigan Bay, Wales); the records are not. Photos are drawn
silhouettes, with EXIF DateTimeOriginal, OffsetTimeOriginal and GPS written by piexif.

Run: python3 make_demo.py   (needs Pillow and piexif from PyPI)
"""
import json
import random
import uuid
from datetime import datetime, timedelta, timezone
from fractions import Fraction

import piexif
from PIL import Image, ImageDraw

random.seed(20261202)

# Beaches along the bay, north to south (approximate public coordinates).
BEACHES = [
    ("Ynyslas", 52.5310, -4.0500),
    ("Borth", 52.4890, -4.0530),
    ("Clarach", 52.4340, -4.0800),
    ("Aberystwyth North", 52.4170, -4.0860),
    ("Tanybwlch", 52.3980, -4.0920),
    ("Llanrhystud", 52.3110, -4.1530),
    ("Aberaeron", 52.2440, -4.2620),
    ("New Quay", 52.2150, -4.3600),
    ("Llangrannog", 52.1600, -4.4700),
    ("Aberporth", 52.1340, -4.5450),
]
OBSERVERS = ["Morwen A.", "Ifan P.", "Dilys R.", "Harri T.", "Nia W.", "Sam K."]
SPECIES = [
    # guess text, setting, length kind, typical cm, photo
    ("small-spotted catshark", "beach_stranding", "total", 55, "catshark.jpg"),
    ("thornback ray", "beach_stranding", "disc_width", 50, "ray.jpg"),
    ("spurdog", "landing_site_or_market", "total", 85, "spurdog.jpg"),
    ("tope", "angler_catch", "total", 140, "tope.jpg"),
    ("common stingray", "beach_stranding", "disc_width", 45, "stingray.jpg"),
    ("nursehound", "angler_catch", "total", 110, None),
    ("blonde ray", "discarded_bycatch", "disc_width", 65, None),
    ("starry smooth-hound", "angler_catch", "total", 90, None),
    ("small-eyed ray", "beach_stranding", "disc_width", 48, None),
    ("basking shark", "floating_at_sea", "total", 650, None),
]
CONDITIONS = ["fresh_dead", "decomposed", "remains_only", "alive"]
UK_SUMMER = timezone(timedelta(hours=1))
UK_WINTER = timezone.utc


def offset_for(day: datetime):
    """British Summer Time, roughly April to October (close enough for demo data)."""
    return UK_SUMMER if 4 <= day.month <= 10 else UK_WINTER


def silhouette(kind: str, path: str):
    img = Image.new("RGB", (960, 720), (222, 205, 170))
    d = ImageDraw.Draw(img)
    for _ in range(400):  # sand grain texture
        x, y = random.randrange(960), random.randrange(720)
        d.point((x, y), fill=(200, 185, 150))
    body = (110, 110, 120)
    if kind in ("ray.jpg", "stingray.jpg"):
        d.polygon([(480, 160), (760, 360), (480, 470), (200, 360)], fill=body)
        d.line([(480, 470), (480, 660)], fill=body, width=10)
        if kind == "stingray.jpg":
            d.polygon([(480, 560), (470, 600), (490, 600)], fill=(60, 60, 60))
        else:
            for _ in range(14):
                x, y = random.randrange(330, 630), random.randrange(260, 420)
                d.ellipse((x, y, x + 10, y + 10), fill=(200, 190, 160))
    else:
        length = {"catshark.jpg": 520, "spurdog.jpg": 620, "tope.jpg": 760}[kind]
        x0, y = 480 - length // 2, 360
        d.polygon([(x0, y), (x0 + 80, y - 45), (x0 + length - 120, y - 30), (x0 + length, y - 90),
                   (x0 + length - 50, y), (x0 + length, y + 70), (x0 + length - 120, y + 25), (x0 + 80, y + 40)], fill=body)
        d.polygon([(x0 + length // 3, y - 40), (x0 + length // 3 + 40, y - 110), (x0 + length // 3 + 90, y - 35)], fill=body)
        if kind == "catshark.jpg":
            for _ in range(30):
                sx, sy = random.randrange(x0 + 60, x0 + length - 150), random.randrange(y - 30, y + 25)
                d.ellipse((sx, sy, sx + 6, sy + 6), fill=(60, 50, 45))
    d.text((20, 690), "wrackline demo photo (drawn, invented)", fill=(90, 80, 60))
    return img


def dms(value: float):
    value = abs(value)
    deg = int(value)
    minutes = int((value - deg) * 60)
    seconds = Fraction((value - deg - minutes / 60) * 3600).limit_denominator(10000)
    return ((deg, 1), (minutes, 1), (seconds.numerator, seconds.denominator))


def write_photo(name, taken: datetime, lat, lon):
    img = silhouette(name, name)
    offset = taken.strftime("%z")
    exif = {
        "0th": {piexif.ImageIFD.Make: b"Demo", piexif.ImageIFD.Orientation: 1},
        "Exif": {
            piexif.ExifIFD.DateTimeOriginal: taken.strftime("%Y:%m:%d %H:%M:%S").encode(),
            piexif.ExifIFD.OffsetTimeOriginal: f"{offset[:3]}:{offset[3:]}".encode(),
        },
        "GPS": {
            piexif.GPSIFD.GPSLatitudeRef: b"N" if lat >= 0 else b"S",
            piexif.GPSIFD.GPSLatitude: dms(lat),
            piexif.GPSIFD.GPSLongitudeRef: b"E" if lon >= 0 else b"W",
            piexif.GPSIFD.GPSLongitude: dms(lon),
            piexif.GPSIFD.GPSHPositioningError: (12, 1),
        },
    }
    img.save(f"photos/{name}", "JPEG", quality=70, exif=piexif.dump(exif))


def main():
    records = []
    start = datetime(2024, 11, 1, 8, 0)
    used_photos = set()
    for i in range(30):
        guess, setting, kind, typical, photo = SPECIES[i % len(SPECIES)] if i < 10 else random.choice(SPECIES)
        beach, lat, lon = random.choice(BEACHES)
        day = start + timedelta(days=random.randrange(0, 720), minutes=random.randrange(0, 600))
        local = day.replace(tzinfo=offset_for(day))
        lat += random.uniform(-0.004, 0.004)
        lon += random.uniform(-0.004, 0.004)
        condition = "alive" if setting in ("angler_catch",) else random.choice(CONDITIONS[:3])
        sub = {
            "client_id": str(uuid.UUID(int=random.getrandbits(128), version=4)),
            "observed_at": local.isoformat(),
            "position": {"latitude": round(lat, 6), "longitude": round(lon, 6),
                         "accuracy_m": random.choice([5, 8, 12, 25, 40]), "source": "device"},
            "species_guess": guess,
            "length": {"kind": kind, "value": round(typical * random.uniform(0.7, 1.25)), "unit": "cm",
                       "method": random.choice(["measured", "estimated"])},
            "sex": random.choice(["unknown", "male", "female"]),
            "count": 1,
            "condition": condition,
            "setting": setting,
            "human_signs": random.choice([[], [], ["hook"], ["net_marks"], ["line", "hook"]]),
            "notes": f"Invented demo record near {beach}.",
            "observer_name": random.choice(OBSERVERS),
        }
        photos = []
        if photo and photo not in used_photos:
            used_photos.add(photo)
            write_photo(photo, local, lat, lon)
            photos.append(photo)
        records.append({"submission": sub, "photos": photos})
    with open("records.json", "w") as out:
        json.dump(records, out, indent=1)
        out.write("\n")


if __name__ == "__main__":
    main()


# Survey walks, from their own random stream so the records above stay as they are.
STRETCHES = [
    ("Borth to Ynyslas", 52.4890, -4.0530, 0.0360, 0.0030, 4.2),
    ("Aberystwyth North to Clarach", 52.4170, -4.0860, 0.0170, 0.0060, 2.1),
    ("New Quay to Llangrannog", 52.2150, -4.3600, -0.0550, -0.1100, 9.0),
]


def walks_around_records(rng):
    """A survey walk around each of the first beach strandings: the record was made on it."""
    with open("records.json") as handle:
        records = json.load(handle)
    walks = []
    strandings = [r for r in records if r["submission"]["setting"] == "beach_stranding"][:12]
    for record in strandings:
        sub = record["submission"]
        seen = datetime.fromisoformat(sub["observed_at"])
        name, *_ = min(STRETCHES, key=lambda s: abs(s[1] - sub["position"]["latitude"]))
        walk_id = str(uuid.UUID(int=rng.getrandbits(128), version=4))
        sub["walk_client_id"] = walk_id
        walks.append({
            "client_id": walk_id,
            "started_at": (seen - timedelta(minutes=40)).isoformat(),
            "ended_at": (seen + timedelta(minutes=50)).isoformat(),
            "stretch": name,
            "all_finds_reported": True,
            "track": [],
            "typed_distance_m": round(rng.uniform(2500, 5000)),
            "observer_name": sub["observer_name"],
        })
    with open("records.json", "w") as out:
        json.dump(records, out, indent=1)
        out.write("\n")
    return walks


def make_walks():
    rng = random.Random(7)
    walks = walks_around_records(random.Random(11))
    start = datetime(2024, 11, 3, 9, 0)
    for i in range(28):
        name, lat, lon, dlat, dlon, km = rng.choice(STRETCHES)
        day = start + timedelta(days=rng.randrange(0, 720), minutes=rng.randrange(0, 300))
        begun = day.replace(tzinfo=offset_for(day))
        hours = km / rng.uniform(2.5, 4.0)
        ended = begun + timedelta(hours=hours)
        walk = {
            "client_id": str(uuid.UUID(int=rng.getrandbits(128), version=4)),
            "started_at": begun.isoformat(),
            "ended_at": ended.replace(microsecond=0).isoformat(),
            "stretch": name,
            "all_finds_reported": rng.random() < 0.8,
            "track": [],
            "typed_distance_m": round(km * 1000 * rng.uniform(0.9, 1.1)),
            "observer_name": rng.choice(OBSERVERS),
        }
        if i % 5 == 0:
            # Every fifth walk carries a GPS track: a fix every 30 s along the stretch.
            steps = int(hours * 120)
            walk["typed_distance_m"] = None
            walk["track"] = [
                {"latitude": round(lat + dlat * k / steps + rng.uniform(-2e-5, 2e-5), 6),
                 "longitude": round(lon + dlon * k / steps + rng.uniform(-2e-5, 2e-5), 6),
                 "accuracy_m": rng.choice([4, 6, 8, 12]),
                 "at": (begun + timedelta(seconds=30 * k)).isoformat()}
                for k in range(steps + 1)
            ]
        walks.append(walk)
    with open("walks.json", "w") as out:
        json.dump(walks, out, indent=1)
        out.write("\n")


if __name__ == "__main__":
    make_walks()


# The demo reviewer's decisions, so the demo's public exports and figures have records in
# them: no randomness, a rule anyone can read. A record with a measured length is
# confirmed at species; the first basking shark with an estimated length gets a question
# back; the rest (three of them with photos) wait for review.
SCIENTIFIC_NAMES = {
    "small-spotted catshark": "Scyliorhinus canicula",
    "thornback ray": "Raja clavata",
    "spurdog": "Squalus acanthias",
    "tope": "Galeorhinus galeus",
    "common stingray": "Dasyatis pastinaca",
    "nursehound": "Scyliorhinus stellaris",
    "blonde ray": "Raja brachyura",
    "starry smooth-hound": "Mustelus asterias",
    "small-eyed ray": "Raja microocellata",
    "basking shark": "Cetorhinus maximus",
}


def make_reviews():
    with open("records.json") as handle:
        records = json.load(handle)
    reviews = []
    asked = False
    for record in records:
        sub = record["submission"]
        measured = sub["length"]["method"] == "measured"
        if measured:
            evidence = "the photo and the measured length" if record["photos"] else "the measured length and the notes"
            reviews.append({"client_id": sub["client_id"], "decision": {
                "action": "confirm",
                "scientific_name": SCIENTIFIC_NAMES[sub["species_guess"]],
                "taxon_rank": "species",
                "remark": f"Demo review: confirmed from {evidence} (an invented decision).",
            }})
        elif sub["species_guess"] == "basking shark" and not asked:
            asked = True
            reviews.append({"client_id": sub["client_id"], "decision": {
                "action": "request_details",
                "message": "Demo review: was the length paced out or guessed from the boat? A photo would help.",
            }})
    with open("reviews.json", "w") as out:
        json.dump(reviews, out, indent=1)
        out.write("\n")


if __name__ == "__main__":
    make_reviews()
