#!/usr/bin/env python3
"""Generate tests/data/translit-fixture.tsv for juncture's script module.

The fixture holds Sanskrit words and short phrases in IAST together with the
Devanagari, Harvard-Kyoto and SLP1 forms that a general-purpose
transliteration library (indic_transliteration, from PyPI) produces from the
IAST column. tests/script_fixture.rs checks juncture::script against it.

Usage (from the repository root):

    pip install indic-transliteration==2.3.82
    python3 scripts/gen_translit_fixture.py [OUTPUT]

OUTPUT defaults to tests/data/translit-fixture.tsv next to this script's
parent folder. The word list below is made of dictionary words, inflected
forms and short phrases composed for this fixture.
"""

import sys
import unicodedata
from importlib.metadata import version
from pathlib import Path

from indic_transliteration import sanscript

LIBRARY = "indic_transliteration"
EXPECTED_VERSION = "2.3.82"

# One entry per line; blank lines and lines starting with '#' are ignored.
WORDS = """
# a-stem masculine: deva
devaḥ
devam
devena
devāya
devāt
devasya
deve
deva
devau
devābhyām
devayoḥ
devāḥ
devān
devaiḥ
devebhyaḥ
devānām
deveṣu
# a-stem neuter: phala
phalam
phale
phalāni
phalena
phalasya
phaleṣu
# ā-stem feminine: senā
senā
senām
senayā
senāyai
senāyāḥ
senāyām
sene
senāḥ
senābhiḥ
senāsu
# i-stem: agni, mati
agniḥ
agnim
agninā
agnaye
agneḥ
agnau
agnayaḥ
agnīn
agnibhiḥ
agnīnām
matiḥ
matyā
matyai
matīḥ
# ī-stem: nadī
nadī
nadīm
nadyā
nadyai
nadyāḥ
nadyām
nadyaḥ
nadīnām
# u-stem: guru, madhu
guruḥ
gurum
guruṇā
gurave
guroḥ
gurau
guravaḥ
gurūn
gurubhiḥ
gurūṇām
madhu
madhunā
madhūni
# ū-stem: vadhū
vadhūḥ
vadhvā
vadhvai
# ṛ-stems: pitṛ, mātṛ, kartṛ, dātṛ
pitā
pitaram
pitrā
pitre
pituḥ
pitari
pitarau
pitaraḥ
pitṝn
pitṛbhiḥ
pitṝṇām
pitṛṣu
mātā
mātaram
mātṝḥ
mātṝṇām
kartā
kartāram
kartṛ
kartṝṇi
dātṝṇām
bhrātṝn
svasṝḥ
# ḷ
kḷpta
kḷptiḥ
kḷpsyati
ḷkāra
ḹkāra
# consonant stems
vāk
vācam
vācā
vāgbhiḥ
vākṣu
rājā
rājānam
rājñā
rājñe
rājñaḥ
rājñi
rājabhiḥ
rājan
ātmā
ātmanā
ātmānam
ātman
manaḥ
manasā
manobhiḥ
manassu
jagat
jagataḥ
jagadbhiḥ
bhagavān
bhagavatā
bhagavate
marut
marutaḥ
dik
diśam
digbhiḥ
vidvān
viduṣā
viduṣaḥ
nāma
nāmnā
nāmāni
karma
karmaṇā
karmāṇi
brahman
brahmaṇā
brahmāṇam
# pronouns
aham
mām
mayā
mahyam
mama
tvam
tvām
tvayā
tubhyam
tava
saḥ
sā
tat
te
tāḥ
tāni
tena
tasya
tasmin
eṣaḥ
eṣā
etat
ayam
iyam
idam
kaḥ
kā
kim
yaḥ
yat
sarvaḥ
sarve
# verbs
bhavati
bhavataḥ
bhavanti
bhavasi
bhavāmi
bhavāmaḥ
abhavat
abhavan
bhaviṣyati
babhūva
bhūtvā
gacchati
gacchanti
agacchat
jagāma
gamiṣyati
gantum
gatvā
karoti
kurutaḥ
kurvanti
akarot
cakāra
kariṣyati
kṛtvā
kartum
dadāti
dattvā
tiṣṭhati
sthitvā
pibati
pītvā
paśyati
dṛṣṭvā
jānāti
jñātvā
śṛṇoti
śrutvā
vadati
uvāca
āha
bravīti
gṛhṇāti
gṛhītvā
yunakti
yuktvā
asti
santi
āsīt
syāt
icchati
iṣṭvā
labhate
lebhe
manyate
jāyate
jajñe
prāpnoti
prāpya
āgacchati
āgatya
# nouns, adjectives, compounds
saṃskṛtam
saṃskāraḥ
saṃdhiḥ
sandhiḥ
samāsaḥ
vibhaktiḥ
pratyayaḥ
dhātuḥ
upasargaḥ
nipātaḥ
avyayam
tatpuruṣaḥ
bahuvrīhiḥ
dvandvaḥ
avyayībhāvaḥ
karmadhārayaḥ
dviguḥ
mahārājaḥ
mahātmā
sūryodayaḥ
gaṇeśaḥ
devālayaḥ
vidyālayaḥ
sarvajñaḥ
dharmakṣetram
kurukṣetram
nīlakaṇṭhaḥ
pītāmbaraḥ
candramukhī
rājapuruṣaḥ
jñānam
vijñānam
yajñaḥ
kṣatriyaḥ
brāhmaṇaḥ
vaiśyaḥ
śūdraḥ
ṛṣiḥ
ṛtuḥ
ṛṇam
ṛkṣaḥ
aiśvaryam
aikyam
aitihyam
auṣadham
aurasaḥ
kaustubhaḥ
gauḥ
nauḥ
dyauḥ
aṅgam
aṅkaḥ
saṅghaḥ
laṅghanam
pañca
sañjayaḥ
vāñchā
kaṭhinam
ṭīkā
kuṇḍalam
ḍamaruḥ
āḍhyaḥ
ūḍhaḥ
piṇḍaḥ
maṇḍalam
kaṇṭhaḥ
jhaṣaḥ
nirjharaḥ
chāyā
icchā
ghaṭaḥ
meghaḥ
dīrghaḥ
bhūmiḥ
pṛthivī
arthaḥ
tathā
dhanam
aṃśaḥ
vaṃśaḥ
siṃhaḥ
haṃsaḥ
saṃyamaḥ
saṃvatsaraḥ
saṃkalpaḥ
saṃgamaḥ
saṃcayaḥ
śaṃkaraḥ
kiṃcit
kathaṃcana
duḥkham
niḥśreyasam
antaḥkaraṇam
punaḥ
prātaḥ
namaḥ
svasti
hṛdayam
gṛham
vṛkṣaḥ
kṛṣṇaḥ
viṣṇuḥ
śivaḥ
lakṣmīḥ
sarasvatī
pārvatī
himālayaḥ
gaṅgā
yamunā
ayodhyā
mithilā
laṅkā
# short phrases (composed)
rāmaḥ vanaṃ gacchati
sītā phalāni khādati
bālakaḥ pustakaṃ paṭhati
guruḥ śiṣyān upadiśati
nadī samudraṃ gacchati
vṛkṣasya chāyāyām upaviśati
ahaṃ jalaṃ pibāmi
tvaṃ kutra gacchasi
kiṃ karoṣi
aham api āgacchāmi
ko 'pi
te 'pi
so 'ham
rāmo 'bravīt
vane 'smin
namaḥ śivāya
śrī gaṇeśāya namaḥ
deva-ālayaḥ
mahā-bhāratam
adhyāyaḥ 2
ślokaḥ 12
iti
iti prathamaḥ adhyāyaḥ
tataḥ kim
yathā tathā
dharmaḥ | satyam ||
iti samāptam ||
# conventions that differ (see EXCLUDED in tests/script_fixture.rs)
praüga
titaü
tām̐l lokān
oṃ namaḥ
"""


def entries():
    seen = set()
    for line in WORDS.splitlines():
        line = line.strip()
        if not line or line.startswith("#"):
            continue
        word = unicodedata.normalize("NFC", line)
        if word in seen:
            raise SystemExit(f"duplicate entry: {word}")
        seen.add(word)
        yield word


def main():
    found = version("indic_transliteration")
    if found != EXPECTED_VERSION:
        print(
            f"warning: {LIBRARY} {found} installed, fixture was made with "
            f"{EXPECTED_VERSION}; the header will name {found}",
            file=sys.stderr,
        )
    root = Path(__file__).resolve().parent.parent
    out = Path(sys.argv[1]) if len(sys.argv) > 1 else root / "tests/data/translit-fixture.tsv"
    out.parent.mkdir(parents=True, exist_ok=True)
    rows = []
    for word in entries():
        cols = [word]
        for target in (sanscript.DEVANAGARI, sanscript.HK, sanscript.SLP1):
            cols.append(sanscript.transliterate(word, sanscript.IAST, target))
        if any("\t" in c or "\n" in c for c in cols):
            raise SystemExit(f"tab or newline in output for {word!r}")
        rows.append(cols)
    with out.open("w", encoding="utf-8", newline="\n") as f:
        f.write(f"# Generated by {LIBRARY} {found} (PyPI indic-transliteration), "
                "sanscript.transliterate(iast, IAST, target)\n")
        f.write(f"# Command: pip install indic-transliteration=={found}; "
                "python3 scripts/gen_translit_fixture.py\n")
        f.write(f"# {len(rows)} entries; columns: iast, devanagari, hk, slp1\n")
        f.write("iast\tdevanagari\thk\tslp1\n")
        for cols in rows:
            f.write("\t".join(cols) + "\n")
    print(f"wrote {len(rows)} entries to {out}")


if __name__ == "__main__":
    main()
