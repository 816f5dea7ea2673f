#!/usr/bin/env python3
"""Regenerate juncture's bundled Germanic lexicons from the `wordfreq` package.

    pip install wordfreq==3.1.1 HanTa==1.2.1 numpy
    python3 scripts/build_lexicons.py                 # all five lexicons
    python3 scripts/build_lexicons.py --lang de nl    # only some of them

Writes lexicons/{german,dutch,swedish,danish,norwegian}.tsv (wordfreq codes
de, nl, sv, da, nb).  The output is deterministic: the same package versions
give byte-identical files (no timestamps are written).

Format (UTF-8, NFC, one entry a line, `#` lines are comments):

    form<TAB>frequency[<TAB>tags]

* frequency -- round(wordfreq.word_frequency(form) * 1e9), i.e. occurrences per
  billion words, at least 1.
* tags -- `key=value` pairs joined by `;`.  The third column (and its tab) is
  left out when a form has no tags.  Keys written by this script:
    pos=noun|verb|adj|adv|other   (German and Dutch only, from HanTa)
    proper=yes                    (HanTa's best reading is a proper noun)
    lemma=FORM, inflected=yes     (German only, see below)
  German nouns (pos=noun) are written capitalised (`Arbeit`), everything else
  in lower case; the engine case-folds on lookup.

Data: wordfreq's word lists are CC BY-SA 4.0 (see lexicons/README.md for the
attribution wordfreq asks for); wordfreq's code is Apache-2.0.  The tags are
computed with HanTa (LGPL-3.0-or-later); no HanTa code or model is copied into
the output, only the part-of-speech labels it assigns.

Filters (applied in this order; every form that fails one is dropped, nothing
is kept with a "junk" tag -- a dropped form cannot be misused by a consumer
that ignores tags):

 1. NFC-normalise.  Keep a form only if every character is a letter of the
    language's alphabet (ALPHABET below): this drops anything with digits,
    apostrophes, hyphens, periods, other punctuation, emoji, other scripts and
    foreign diacritics.
 2. Drop single letters.
 3. Drop forms without a vowel (VOWELS below, `y` counts as a vowel).  These
    are abbreviations, acronyms and interjections (wordfreq's tokenizer strips
    the abbreviation period): str, bzw, ggf, nr, km, tv, hmm.
 4. Two-letter forms are kept only if frequency >= TWO_LETTER_MIN (500,000 per
    billion, i.e. 0.05 % of all tokens -- in every one of these lists that
    threshold keeps only native function words such as de `zu`, nl `op`,
    sv `på`) or if they are in the language's ALLOW_TWO list: common content
    words that are productive compound parts (de Öl, Ei; sv/nb/da øl/öl, is,
    by ...).  Everything else of two letters (dr, tv, ok, eu, of, ...) goes.
 5. Letter runs: a letter repeated 4+ times is dropped (sooo, jaaaa, hmmm).
    A run of exactly 3 is kept only where the form splits at the run into
    two forms of at least 3 letters that are themselves in the filtered list
    (Schifffahrt = schiff + fahrt, stressstoornis = stress + stoornis);
    elongations (seeehr, sååå, heeel) and roman numerals (iii, xiii) go.
 6. ABBREVIATIONS: per-language hand list of common abbreviations that do
    contain a vowel and so survive rule 3 (de usw, evtl, inkl, ca; nl enz,
    bijv; sv osv, pga; ...).  None of them is a word of the language.
 7. FRAGMENTS: per-language hand list of derivational/inflectional suffixes and
    unstressed prefixes that appear as tokens only through hyphenation at line
    ends, gender forms (Lehrer*innen, Bürger:innen) or OCR: de ung, heit, keit,
    lich, chen, nen, ner, ver; nl heid, lijk, tje; sv ning, het-en ...  Each
    list was checked so that it holds no real word (de `bar`, `los`, `haft`,
    `schaft`, `innen`, `ende`; sv `het`, `dom`; da `lig`, `hed` are words and
    stay).
 8. MAX_ENTRIES: keep at most this many forms (highest frequency first) so
    that each file stays under ~15 MB.

Tagging (German and Dutch, HanTa):
  * Dutch: tag_word on the lower-case form with casesensitive=False; the
    candidate readings are grouped into noun/verb/adj/adv/other, their
    probabilities summed per group, and the best group wins.
  * German: a case-folded form stands for a noun and possibly another word
    (Abend / abend), so tag_word is asked about both spellings with case
    (casesensitive=True): noun readings from the capitalised spelling, the
    others from the lower-case one.  The best group wins; a second reading
    across the noun / non-noun divide is kept within SECOND_MARGIN (not for
    function words) and written as a line without a frequency.  Each
    reading gets HanTa's lemma (analyze) where it differs from the form,
    and finite verbs / inflected adjectives get inflected=yes.  A noun is a
    proper noun only when its NE reading beats NN by PROPER_MARGIN.  Forms
    HanTa does not know (UNKNOWN_SCORE) keep no lemma, and short ones are
    dropped unless they are the lemma of a known form; a lemma of a noun
    form gets a noun reading.  --tag-cache keeps HanTa's answers for reruns.
  * verb preference: if the form ends in -n (the shape of an infinitive) and
    the verb group is at least exp(-VERB_MARGIN) (= 1/7.4) as probable as the
    winner, pos=verb.  Nominalised infinitives (das Schreiben, het lopen) are
    thereby verbs, so the rule-set can use the verb stem (Schreibtisch);
  * German only: wordfreq spells ß as `ss` (it case-folds); HanTa knows ß
    spellings better, so forms with `ss` are also tagged with `ss`->`ß`
    variants and the best-scored variant's reading is used.
  * German only, ß restored: each `ss` of a form (and of its lemma) is
    written `ß` where the spelling dictionary of the current orthography
    (igerman98 as packaged by Debian in hunspell-de-de, /usr/share/hunspell/
    de_DE.dic, every form of it listed by hunspell-tools' unmunch) says so:
    the longest dictionary form (or verb stem, the infinitive without
    -en/-n) that covers that place of the form decides
    (Fuß in Fußball, Straße, groß, schließlich; but Schloss, Genuss, dass,
    musste).  Where no dictionary word covers it, or a word with ß and one
    with ss cover it equally (Masse / Maße), `ss` stays.  HanTa cannot decide
    this: its model spells the older way (daß, Schloß).  Only the choice
    between ß and ss is taken from the dictionary, none of its words.
Swedish, Danish and Norwegian have no tags: no package on PyPI ships a POS
model for them that runs offline (spaCy/stanza/UDPipe models are downloaded
at run time; simplemma gives lemmas only).
"""

import argparse
import math
import os
import sys
import time
import unicodedata
from importlib import metadata

WORDFREQ_VERSION = "3.1.1"
HANTA_VERSION = "1.2.1"
TWO_LETTER_MIN = 500_000  # per billion words
VERB_MARGIN = 2.0  # natural-log units: verb reading >= best / e**2

LANGS = {
    "de": dict(name="German", file="german.tsv", tagger="morphmodel_ger.pgz",
               max_entries=400_000),
    "nl": dict(name="Dutch", file="dutch.tsv", tagger="morphmodel_dutch.pgz",
               max_entries=None),
    "sv": dict(name="Swedish", file="swedish.tsv", tagger=None, max_entries=None),
    "da": dict(name="Danish", file="danish.tsv", tagger=None, max_entries=None),
    "nb": dict(name="Norwegian (Bokmål)", file="norwegian.tsv", tagger=None,
               max_entries=None),
}

_AZ = "abcdefghijklmnopqrstuvwxyz"
# Letters of each language's orthography (lower case).  German: the official
# alphabet plus umlauts and ß (wordfreq folds ß to ss, so ß never occurs).
# Dutch: trema and the accents of standard spelling (één, café, hè, enquête,
# façade); emphasis accents (á, ó, ú, í) and other loans are not letters.
# Swedish/Danish/Norwegian: their extra letters plus é (idé, armé, allé);
# Norwegian also ô, ò (fôr, òg).
ALPHABET = {
    "de": _AZ + "äöüß",
    "nl": _AZ + "ëïöüéèêç",
    "sv": _AZ + "åäöé",
    "da": _AZ + "æøåé",
    "nb": _AZ + "æøåéôò",
}
VOWELS = {
    "de": "aeiouyäöü",
    "nl": "aeiouyëïöüéèê",
    "sv": "aeiouyåäöé",
    "da": "aeiouyæøåé",
    "nb": "aeiouyæøåéôò",
}

# Two-letter content words below TWO_LETTER_MIN that are real words and
# productive compound parts (first or last):
ALLOW_TWO = {
    "de": {"ei", "öl"},                 # Ei (Eigelb, Hühnerei), Öl (Ölpreis, Olivenöl)
    "nl": {"ei", "ui", "os", "as"},     # ei (eierdop), ui (uiensoep), os (ossenstaart),
                                        # as (asbak, wielas)
    "sv": {"by", "ek", "is", "ko", "ny", "ur", "öl", "ås", "ål"},
                                        # by (bygata), ek (ekträ), is (isbjörn), ko (komjölk),
                                        # ny (nybyggd), ur (urmakare), öl (ölglas), ås, ål
    "nb": {"by", "is", "ku", "ny", "øl", "øy", "ås", "ål"},
                                        # by (bysentrum), is (iskrem), ku (kumelk), ny,
                                        # øl (ølflaske), øy (øygruppe), ås, ål
    "da": {"by", "is", "ko", "ny", "øl", "ål", "ås"},
                                        # by (byrådet), is (isbjørn), ko (komælk), ny,
                                        # øl (ølflaske), ål, ås
}

# Abbreviations that contain a vowel (so rule 3 does not catch them) and are
# common enough to be in the lists without their period.  None is a word.
ABBREVIATIONS = {
    "de": set("""
        abb abk abs ahd akk allg anm aufl aug ausg bearb bez ca ders dez dipl ebd ehem
        eigtl einschl engl entspr erw etc etw evt evtl exkl feb febr geb gebr gem
        gesch gest griech ggü incl inh ing inkl insb isbn ital jul jun kath lat
        mind min mio nachm nov okt orig prof ref resp sep sept tel techn theol
        univ usw uvm verf verh verl vol vorm westf
        """.split()),
    "nl": set("""
        afb afd art aub bijv ca div enz etc evt excl feb gem incl ing ipv ivm
        mevr nav nov okt ong pag prof resp sep sept tov vert
        """.split()),
    "sv": set("""
        ang aug avd bla ca dec enl etc exkl feb forts inkl milj nov okt osv pga
        resp sek sep sept tel tex uppl
        """.split()),
    "nb": set("""
        ang aug avd bla ca des div ekskl etc evt feb forts ifm iflg ift iht inkl
        mill mva nov okt osv pga sep sept vedr
        """.split()),
    "da": set("""
        afd ang aug bla ca dec div ekskl etc evt feb forts ifm iflg iht inkl mia
        mio nov okt osv pga sep sept vedr
        """.split()),
}

# Affix fragments (see rule 7).  Checked against each language: no entry is a
# word on its own.
FRAGMENTS = {
    "de": set("""
        ale alen ant anten barkeit chen ele eln emp ent enz enzen erin erinnen
        ern ens ers est ete eten heit heiten ien ieren iert ierte ierung
        ierungen ige igen iger iges igkeit iker isch ische ischen ischer isches
        isten istin ismus ität itäten ive iven keit keiten lein lich liche
        lichen licher liches lichkeit ling linge losigkeit nen ner ners nis
        nisse ös öse ösen sam sch schaften ste sten ster stes ten ter tes tet
        tion tionen tum tümer tur ung ungen ungs ver zer
        """.split()),
    "nl": set("""
        aars achtig achtige ant anten baarheid eel ele elijk ens ent ering erij
        ers eur ief ige ine ines ing ingen isch ische isme ist isten jes heid
        lijk lijke lijkheid ling lingen sie sies ste sten sters tie ties tje
        tjes
        """.split()),
    "sv": set("""
        ade ades are aren arna ast aste else elsen erna eri heten iga ighet igt
        ing isk iska ism ismen ist ister lig ligt ning ningar ningen sam skap
        skapen tion tionen
        """.split()),
    "nb": set("""
        ast aste else elsen ere eren eri heten ige ighet ing isk iske isme ist
        ister itet lig lige ning ningen ninger tion tionen
        """.split()),
    "da": set("""
        else elsen ere eren eri est ige ighed ing isk iske isme ist ister itet
        ning ningen ninger tion tionen
        """.split()),
}

FILTER_SUMMARY = [
    "NFC; only letters of the alphabet [{alphabet}] (no digits, apostrophes, hyphens, periods, other scripts)",
    "no single letters",
    "at least one vowel [{vowels}] (drops str, bzw, nr, hmm ...)",
    "2-letter forms only if frequency >= {two_min} per billion or in allow list: {allow2}",
    "no letter 4+ times in a row; a triple letter only where the form splits there into two listed forms of >= 3 letters",
    "hand list of {n_abbr} vowel-containing abbreviations dropped (e.g. {abbr_ex})",
    "hand list of {n_frag} affix fragments dropped (e.g. {frag_ex})",
    "{limit}",
]

# --- part-of-speech mapping -------------------------------------------------

def coarse_de(tag):
    """Map a HanTa STTS-style German tag to (pos, proper)."""
    if tag == "NE":
        return "noun", True
    if tag in ("NN", "NNA"):
        return "noun", False
    if tag == "NNI" or tag.startswith(("VV", "VA", "VM")):
        return "verb", False  # NNI = nominalised infinitive (das Wandern)
    if tag.startswith("ADJ"):
        return "adj", False
    if tag in ("ADV", "PROAV", "PWAV"):
        return "adv", False
    return "other", False


def coarse_nl(tag):
    """Map a HanTa CGN-style Dutch tag to (pos, proper)."""
    if tag.startswith(("N(eigen", "N_VAR(eigen")):
        return "noun", True
    if tag == "N" or tag.startswith(("N(", "N_VAR")):
        return "noun", False
    if tag.startswith("WW"):
        return "verb", False
    if tag.startswith("ADJ"):
        return "adj", False
    if tag.startswith("BW"):
        return "adv", False
    return "other", False


def logaddexp(a, b):
    if a < b:
        a, b = b, a
    return a + math.log1p(math.exp(b - a))


def choose_pos(form, candidates, coarse):
    """candidates: [(tag, logp)] from HanTa.  Returns (pos, proper) or None."""
    groups = {}
    proper_lp = {}
    for tag, lp in candidates:
        if tag in ("UNKNOWN", "EMPTY"):
            continue
        lp = float(lp)
        pos, proper = coarse(tag)
        groups[pos] = logaddexp(groups[pos], lp) if pos in groups else lp
        if pos == "noun":
            key = proper
            proper_lp[key] = logaddexp(proper_lp[key], lp) if key in proper_lp else lp
    if not groups:
        return None
    best = max(groups, key=lambda p: (groups[p], p))
    if (best != "verb" and form.endswith("n") and "verb" in groups
            and groups["verb"] >= groups[best] - VERB_MARGIN):
        best = "verb"
    proper = False
    if best == "noun":
        proper = proper_lp.get(True, -math.inf) > proper_lp.get(False, -math.inf)
    return best, proper


class Tagger:
    """Dutch: one reading per form, from HanTa's tag_word on the lower-case form."""

    def __init__(self, lang, model):
        from HanTa import HanoverTagger as ht
        self.lang = lang
        self.t = ht.HanoverTagger(model)
        self.coarse = coarse_nl

    def _cands(self, word):
        return [(tag, float(lp)) for tag, lp in
                self.t.tag_word(word, cutoff=6, casesensitive=False)]

    def readings(self, form):
        res = choose_pos(form, self._cands(form), self.coarse)
        if res is None:
            return []
        pos, proper = res
        return [dict(pos=pos, proper=proper)]


# German readings.  wordfreq folds case, so `abend` stands for both `Abend`
# (noun) and `abend` (adverb).  HanTa is asked about both spellings with case
# taken into account: noun readings come from the capitalised spelling, all
# other readings from the lower-case one (each spelling scored the way it is
# written in running text).  A second reading is kept when it is within
# SECOND_MARGIN of the best one.
SECOND_MARGIN = 3.0
# The margin for an uninflected homograph of an inflected best reading
# (weiß: finite verb of wissen -8.9, adjective -12.1).
INFLECTED_SECOND_MARGIN = 4.0
# A noun is a proper noun only when HanTa's proper-noun reading beats its
# common-noun reading clearly.  Forms HanTa knows as both score within about
# 5 of each other (Hof +0.2, Rose +1.6, Bad +2.6, Wolf +3.5, Mark -5.2);
# names it knows only as names have no common-noun reading at all (Tom,
# Bern, Müller, Paris).
PROPER_MARGIN = 5.0
# Finite verb forms and inflected attributive adjectives are not compound
# members (sprach, kamen, große); imperatives are the bare verb stem (fahr,
# schwimm) and participles are used as adjectives, so those are not marked.
INFLECTED_TAGS = ("VVFIN", "VAFIN", "VMFIN", "ADJA")
# Unknown short forms.  HanTa scores the words of its lexicon above about -20
# (log-probability) and guesses unknown strings far lower (-26 and below).
# A form of at most UNKNOWN_MAX_LEN letters that scores below UNKNOWN_SCORE
# on both spellings, is not the lemma of a form HanTa knows and is not a
# form of the spelling dictionary (see SharpS) is a fragment of hyphenation,
# a foreign token or a typo (cke, ssel, ucht, esben, jau), and is dropped.
# Huhn stays: it is the lemma of Hühner; Teig and Senf stay: HanTa does not
# know them, the spelling dictionary does.
UNKNOWN_SCORE = -25.0
UNKNOWN_MAX_LEN = 5


def fold_ss(word):
    return word.replace("ß", "ss")


SPELLING_DIC = "/usr/share/hunspell/de_DE.dic"
SPELLING_AFF = "/usr/share/hunspell/de_DE.aff"
SPELLING_PACKAGE = "hunspell-de-de"
SPELLING_TOOLS_PACKAGE = "hunspell-tools"


class SharpS:
    """Puts ß back where wordfreq's case folding wrote ss, following a
    spelling dictionary of the current orthography (see the module text)."""

    MIN_COVER = 3  # a dictionary word shorter than this decides nothing
    MIN_STEM = 4  # shortest verb stem taken from an infinitive
    MAX_WORD = 40

    def __init__(self, dic, aff):
        import subprocess
        # Every form the dictionary spells (its words with their affixes
        # applied, by hunspell-tools' unmunch), so that inflected forms
        # (Pässe, Füße, hießen) decide for themselves.
        try:
            forms = subprocess.run(["unmunch", dic, aff], capture_output=True, check=True,
                                   text=True, errors="replace").stdout.split("\n")
        except (OSError, subprocess.CalledProcessError) as e:
            sys.exit(f"unmunch failed ({e}): apt-get install {SPELLING_TOOLS_PACKAGE}")
        # A word listed without affix flags is mostly a name (Strauss beside
        # Strauß); it loses a tie to an inflecting word.
        bare = set()
        with open(dic, encoding="utf-8", errors="replace") as f:
            for line in f:
                raw = line.strip()
                if raw and "/" not in raw:
                    bare.add(unicodedata.normalize("NFC", raw))
        # folded spelling -> {(spelling, inflects)}
        self.words = {}
        # every form, lower case, ß folded (as wordfreq writes it)
        self.known = set()
        for raw in forms:
            word = unicodedata.normalize("NFC", raw.strip())
            if not word.isalpha():
                continue
            self.known.add(fold_ss(word.lower()))
            inflects = word not in bare
            lower = word.lower()
            spellings = {lower}
            if word == lower:
                # a verb's stem as a first part or before -te (grüß-te); at
                # least MIN_STEM letters, so that an adverb in -en gives no
                # stem (außen: no auß- in Nikolausstraße)
                for suffix in ("en", "ern", "eln", "n"):
                    if lower.endswith(suffix) and len(lower) - len(suffix) >= self.MIN_STEM:
                        spellings.add(lower[:-len(suffix)])
            for w in spellings:
                if "ß" in w or "ss" in w:
                    self.words.setdefault(fold_ss(w), set()).add((w, inflects))
        self.memo = {}

    @staticmethod
    def _kind_at(spelling, start, i):
        """'ß' or 'ss' if `spelling`, laid over the folded form from `start`,
        has that at folded position `i`; else None."""
        j = start
        k = 0
        while k < len(spelling):
            if j == i:
                if spelling[k] == "ß":
                    return "ß"
                if spelling.startswith("ss", k):
                    return "ss"
                return None
            j += 2 if spelling[k] == "ß" else 1
            k += 1
        return None

    def _decide(self, form, i):
        """True if the ss at folded position i is written ß."""
        best = None  # (covered length, has flags, is ß)
        n = len(form)
        for a in range(max(0, i - self.MAX_WORD), i + 1):
            for b in range(max(i + 2, a + self.MIN_COVER), min(n, a + self.MAX_WORD) + 1):
                for spelling, inflects in self.words.get(form[a:b], ()):
                    kind = self._kind_at(spelling, a, i)
                    if kind is None:
                        continue
                    cand = (b - a, inflects, kind == "ß")
                    # longer cover wins, then an inflecting word over
                    # an unflagged one (a name); a tie keeps ss
                    if best is None or cand[:2] > best[:2] or (cand[:2] == best[:2] and not cand[2]):
                        best = cand
        return bool(best and best[2])

    def respell(self, word):
        """`word` with ß where the dictionary writes it; the case is kept."""
        if "ss" not in word.lower():
            return word
        if word in self.memo:
            return self.memo[word]
        form = word.lower()
        out = []
        k = 0
        while k < len(form):
            if form.startswith("ss", k) and self._decide(form, k):
                out.append("ß")
                k += 2
            else:
                out.append(form[k])
                k += 1
        res = "".join(out)
        if word[:1].isupper():
            res = res[:1].upper() + res[1:]
        self.memo[word] = res
        return res


class GermanTagger:
    def __init__(self, model):
        from HanTa import HanoverTagger as ht
        self.t = ht.HanoverTagger(model)
        self.last_score = -math.inf

    def _cands(self, word):
        """Best-scored ß spelling's candidates, case-sensitive."""
        def get(w):
            return [(tag, float(lp)) for tag, lp in
                    self.t.tag_word(w, cutoff=6, casesensitive=True)]
        best_w, best = word, get(word)
        if "ss" in word:
            # wordfreq folded ß to ss; let HanTa also see the ß spellings.
            idx = [i for i in range(len(word) - 1) if word.startswith("ss", i)]
            variants = [word[:i] + "ß" + word[i + 2:] for i in idx]
            if len(idx) > 1:
                variants.append(word.replace("ss", "ß"))
            for v in variants:
                vc = get(v)
                if vc and (not best or max(p for _, p in vc) > max(p for _, p in best)):
                    best_w, best = v, vc
        return best_w, best

    def _lemma(self, word, tag, form):
        lemma, _ = self.t.analyze(word, taglevel=1, pos=tag)
        lemma = fold_ss(unicodedata.normalize("NFC", str(lemma)))
        if not lemma or lemma.lower() == form.lower() or not lemma.isalpha():
            return None
        return lemma

    def readings(self, form):
        """[{pos, proper, lemma, inflected}], the best reading first."""
        cap = form[0].upper() + form[1:]
        uc_word, uc = self._cands(cap)
        lc_word, lc = self._cands(form)
        groups = {}  # pos -> (summed logp, best tag, its logp, spelling)

        def add(pos, tag, lp, word):
            if pos in groups:
                total, btag, blp, bword = groups[pos]
                total = logaddexp(total, lp)
                if lp > blp:
                    btag, blp, bword = tag, lp, word
                groups[pos] = (total, btag, blp, bword)
            else:
                groups[pos] = (lp, tag, lp, word)

        nn = ne = -math.inf
        for tag, lp in uc:
            pos, proper = coarse_de(tag)
            if tag.startswith("N"):
                add(pos, tag, lp, uc_word)
                if proper:
                    ne = logaddexp(ne, lp) if ne > -math.inf else lp
                elif pos == "noun":
                    nn = logaddexp(nn, lp) if nn > -math.inf else lp
        for tag, lp in lc:
            if tag in ("UNKNOWN", "EMPTY") or tag.startswith("N"):
                continue
            pos, _ = coarse_de(tag)
            add(pos, tag, lp, lc_word)
        self.last_score = -math.inf
        if not groups:
            return []
        self.last_score = max(lp for _, lp in uc + lc)
        order = sorted(groups, key=lambda p: (-groups[p][0], p))
        best = order[0]
        if (best != "verb" and form.endswith("n") and "verb" in groups
                and groups["verb"][0] >= groups[best][0] - VERB_MARGIN):
            best = "verb"
        chosen = [best]
        # A second reading across the noun / non-noun divide.
        for p in order:
            if p != best and (p == "noun") != (best == "noun"):
                if groups[p][0] >= groups[best][0] - SECOND_MARGIN:
                    chosen.append(p)
                break
        # An inflected best reading (a finite verb, an inflected adjective)
        # cannot be a compound member, so an uninflected homograph of
        # another non-noun group is kept as well: weiß is a form of wissen
        # and the adjective of Weißwein.
        best_tag = groups[best][1].replace("(", "").replace(")", "")
        if best != "noun" and best_tag.startswith(INFLECTED_TAGS):
            for p in order:
                if p in chosen or p in ("noun", "other"):
                    continue
                tag = groups[p][1].replace("(", "").replace(")", "")
                if (groups[p][0] >= groups[best][0] - INFLECTED_SECOND_MARGIN
                        and not tag.startswith(INFLECTED_TAGS)):
                    chosen.append(p)
                break
        out = []
        for pos in chosen:
            _, tag, _, word = groups[pos]
            r = dict(pos=pos, proper=False, lemma=None, inflected=False)
            if pos == "noun" and ne > -math.inf:
                # How much better the proper-noun reading is (decided in finish_reading).
                r["name_margin"] = ne - nn if nn > -math.inf else math.inf
            r["lemma"] = self._lemma(word, tag, form)
            stts = tag.replace("(", "").replace(")", "")
            r["inflected"] = r["lemma"] is not None and stts.startswith(INFLECTED_TAGS)
            out.append(r)
        return out


# A verb reading of a short form with a lemma that the spelling dictionary
# does not know is a fragment HanTa has made a participle of (ren -> lemma
# "ger", len -> "geln"): a real short verb form has a real lemma (geh ->
# gehen, tu -> tun).  Such readings are dropped, and the form with them when
# it has no other reading.
STRAY_VERB_MAX_LEN = 4


def stray_verb(reading, known):
    """The reading is a verb whose lemma is not a known word."""
    return (reading["pos"] == "verb" and bool(reading.get("lemma"))
            and fold_ss(reading["lemma"].lower()) not in known)


def vowelless_lemma(reading, vowels):
    """The reading's lemma has no vowel: the tagger read an abbreviation as the
    stem of an inflected form (lte: lemma lt, Mme: lemma Mm)."""
    lemma = reading.get("lemma")
    return bool(lemma) and not any(c in vowels for c in lemma.lower())


def is_unknown(score):
    """HanTa does not know the form: its best reading scores below UNKNOWN_SCORE."""
    return score is not None and score < UNKNOWN_SCORE


def strip_lemma(r):
    return dict(r, lemma=None, inflected=False)


def second_reading_rule(readings):
    """A function word keeps its one reading: the noun homographs of `aus`,
    `in`, `ich`, `elf` (das Aus, das Ich, die Elf) would make parts of
    Ausweis, Termin, freundlich and Elfenbein."""
    if readings and readings[0]["pos"] == "other":
        return readings[:1]
    return readings


def finish_reading(r):
    """Decides `proper` from HanTa's margin; a proper noun keeps no lemma."""
    r = dict(r)
    margin = r.pop("name_margin", None)
    if margin is not None and margin > PROPER_MARGIN:
        r.update(proper=True, lemma=None, inflected=False)
    return r


def noun_lemmas(tagged):
    """Lower-cased lemmas of the noun readings."""
    return {r["lemma"].lower() for _, _, rs, _ in tagged for r in rs
            if r.get("lemma") and r["pos"] == "noun"}


def with_lemma_reading(entry, lemmas):
    """A form that is the lemma of a listed noun form is a noun: HanTa may not
    know it by itself (Huhn, known only as the lemma of Hühner).  An unknown
    form gets the noun reading alone, a known one gets it added, except a
    function word (see second_reading_rule)."""
    form, freq, readings, score = entry
    if form not in lemmas or any(r["pos"] in ("noun", "other") for r in readings):
        return entry
    noun = dict(pos="noun", proper=False, lemma=None, inflected=False)
    if is_unknown(score) or not readings:
        return (form, freq, [noun], score)
    return (form, freq, readings + [noun], score)


def nominalised_adjective(entry):
    """A noun reading (without a lemma) of an inflected adjective form is a
    nominalised adjective (die Zentrale, das Soziale, der Kranke); it is
    tagged nominalised=yes.  As a first part such a form does not lose its
    -e: Zentralbank is zentral + Bank, not Zentrale with its -e dropped
    (the rule-set's subtraction rules need `left.nominalised != yes`); it
    still takes the weak -n (Kranke + n + Haus)."""
    form, freq, readings, score = entry
    if not any(r["pos"] == "adj" and r.get("inflected") for r in readings):
        return entry
    out = [dict(r, nominalised=True) if r["pos"] == "noun" and not r.get("lemma") and not r.get("proper")
           else r for r in readings]
    return (form, freq, out, score)


def plural_flags(dic):
    """Noun stems of the spelling dictionary (capitalised words) with the
    plural their affix flags give: flag N adds -n (Spinne/N: Spinnen), flag
    P adds -en and is the plural only when the stem has no plural -e (flag
    E): Frau/P, Bahn/P, but Stern/EP, whose -en is the dative plural.
    Returns ({folded stem: ending}, {folded nouns of their own}): a noun of
    its own is a stem with the genitive -s (flag S), such as Posten/S, which
    is no plural of Post. Lower case, ß folded to ss."""
    plurals, own = {}, set()
    with open(dic, encoding="utf-8", errors="replace") as f:
        for line in f:
            raw = unicodedata.normalize("NFC", line.strip())
            stem, _, flags = raw.partition("/")
            if not stem[:1].isupper() or not stem.isalpha():
                continue
            key = fold_ss(stem.lower())
            if "S" in flags:
                own.add(key)
            if "N" in flags and key.endswith("e"):
                plurals[key] = "n"
            elif "P" in flags and "E" not in flags and key not in plurals:
                plurals[key] = "en"
    return plurals, own


def with_dictionary_plurals(tagged, plurals, own):
    """A noun's regular plural that the tagger read only as another word
    (spinnen, tasten, waren: verbs), as a noun of its own (Kanten) or as a
    form of another noun (Ecken: Eck) is made a form of that noun, where the
    spelling dictionary gives the noun that plural and does not list the
    plural as a noun of its own (see plural_flags), and the plural is not
    read as a name (Rügen, Ellen: betrügen is no verb stem + Rügen,
    generellen no Gen + Ellen): its noun readings without a lemma get the
    noun as their lemma, and a plural with none gets a noun reading with
    it. The linking -n-/-en- rules are `attested` and need it (Spinnennetz,
    Ecke + n + Schutz), and a plural read as a noun of its own shadows them
    (Kantenlänge was Kanten + Länge). Returns (entries, count)."""
    index = {f: i for i, (f, _, _, _) in enumerate(tagged)}
    lemma_of = {}
    for form, _, readings, _ in tagged:
        ending = plurals.get(form)
        if ending is None or not any(
                r["pos"] == "noun" and not r.get("lemma") and not r.get("proper")
                and not r.get("nominalised") for r in readings):
            continue
        plural = form + ending
        i = index.get(plural)
        if i is None or i in lemma_of or plural in own or any(
                r.get("proper") or (r["pos"] == "noun" and r.get("lemma")
                                    and fold_ss(r["lemma"].lower()) == form)
                for r in tagged[i][2]):
            continue
        lemma_of[i] = form[0].upper() + form[1:]

    def own_noun(r):
        return r["pos"] == "noun" and not r.get("lemma") and not r.get("nominalised")

    out = []
    for i, (f, q, rs, sc) in enumerate(tagged):
        lemma = lemma_of.get(i)
        if lemma is not None:
            if any(own_noun(r) for r in rs):
                rs = [dict(r, lemma=lemma) if own_noun(r) else r for r in rs]
            else:
                rs = rs + [dict(pos="noun", proper=False, lemma=lemma, inflected=False)]
        out.append((f, q, rs, sc))
    return out, len(lemma_of)


COMBINING_ENDINGS = ["", "s", "es", "n", "en", "e", "er", "ns", "ens"]
UMLAUT_BACK = {"ä": "a", "ö": "o", "ü": "u"}


def combining_forms(dic):
    """The forms the spelling dictionary gives each noun as the first member
    of a compound: {noun as the dictionary writes it: {forms, lower case}}.

    igerman98 marks every word that may begin a compound as it is (affix
    flags i/j: Bahn, Kraft) and lists the forms that only begin compounds
    with the flag h as well (Arbeits/hij, Schul/hij, Kinder/hij). Such a
    form belongs to the noun it is made from by a linking ending
    (COMBINING_ENDINGS: Arbeit + s, Sonne + n), by an umlaut with -e or -er
    (Hände, Häuser) or by dropping a final -e (Schul, Geschicht + s). The
    dictionary's own compounds add the first members they are written
    with, where the word splits into a first member and a word of the
    dictionary in one way only (Arbeitgeber: Arbeit; Tagebuch: Tage;
    Bahnsteig splits two ways, Bahn + steig and Bahns + teig, and adds
    nothing); a first member that is a word of its own belongs to that
    word only (Arbeiter in Arbeiterpartei is not Arbeit + er)."""
    stems, words, entries = {}, set(), []
    with open(dic, encoding="utf-8", errors="replace") as f:
        for line in f:
            raw = unicodedata.normalize("NFC", line.strip())
            word, _, flags = raw.partition("/")
            if not word.isalpha():
                continue
            entries.append((word, flags))
            if word[:1].isupper():
                stems.setdefault(word, set()).update(flags)
            if "h" not in flags:
                words.add(word.lower())
    nouns = {w for w, flags in stems.items() if "h" not in flags}

    def de_umlaut(stem):
        for i in range(len(stem) - 1, -1, -1):
            if stem[i] in UMLAUT_BACK:
                return stem[:i] + UMLAUT_BACK[stem[i]] + stem[i + 1:]
        return None

    def bases(form):
        out = set()
        for ending in COMBINING_ENDINGS:
            if not form.endswith(ending):
                continue
            stem = form[:len(form) - len(ending)]
            if len(stem) < 2:
                continue
            candidates = {stem}
            back = de_umlaut(stem)
            if back and ending in ("e", "er"):
                candidates.add(back)
            if ending in ("", "s"):
                candidates.add(stem + "e")
            out |= {c for c in candidates if c in nouns}
        return out

    forms = {}
    for word, flags in stems.items():
        if not {"i", "j"} & flags:
            continue
        if "h" not in flags:
            forms.setdefault(word, set()).add(word.lower())
            continue
        for noun in bases(word):
            if noun != word:
                forms.setdefault(noun, set()).add(word.lower())
    for word, flags in entries:
        if "h" in flags:
            continue
        low = word.lower()
        found = set()
        for i in range(2, len(low) - 2):
            if len(low) - i < 3 or low[i:] not in words:
                continue
            first = word[0].upper() + low[1:i]
            if first in nouns:
                found.add((first, first.lower()))
            elif first.lower() not in words:
                found |= {(noun, first.lower()) for noun in bases(first)}
        if len({f for _, f in found}) == 1:
            for noun, form in found:
                forms.setdefault(noun, set()).add(form)
    return forms


def with_combining_forms(tagged, forms):
    """The noun reading (no lemma, no name, not nominalised) of each form
    that combining_forms knows gets `combining=FORM|FORM…` (lower case, ß
    as the dictionary writes it; the engine normalizes both sides). The
    rule-set's `unlisted-combining-cost` ranks a first member written in
    another form lower. Returns (entries, count)."""
    folded = {}
    for noun, fs in forms.items():
        folded.setdefault(fold_ss(noun.lower()), set()).update(fs)
    out, count = [], 0
    for f, q, rs, sc in tagged:
        listed = folded.get(f)
        if listed:
            new = []
            for r in rs:
                if (r["pos"] == "noun" and not r.get("lemma") and not r.get("proper")
                        and not r.get("nominalised")):
                    r = dict(r, combining="|".join(sorted(listed)))
                    count += 1
                new.append(r)
            rs = new
        out.append((f, q, rs, sc))
    return out, count


def reading_tags(r):
    tags = [f"pos={r['pos']}"]
    if r.get("proper"):
        tags.append("proper=yes")
    if r.get("lemma"):
        tags.append(f"lemma={r['lemma']}")
    if r.get("inflected"):
        tags.append("inflected=yes")
    if r.get("nominalised"):
        tags.append("nominalised=yes")
    if r.get("lexicalised"):
        tags.append("lexicalised=yes")
    if r.get("combining"):
        tags.append(f"combining={r['combining']}")
    return tags


LEXICALISED_FILE = "german-lexicalised.txt"


def load_lexicalised():
    """Case-folded forms of lexicons/german-lexicalised.txt (a hand list, see
    its header), ß folded to ss as in the word list; empty without a file."""
    here = os.path.dirname(os.path.abspath(__file__))
    path = os.path.join(os.path.dirname(here), "lexicons", LEXICALISED_FILE)
    if not os.path.exists(path):
        return set()
    out = set()
    with open(path, encoding="utf-8") as f:
        for line in f:
            word = line.split("#", 1)[0].strip()
            if word:
                out.add(fold_ss(unicodedata.normalize("NFC", word).lower()))
    return out


# --- filtering ---------------------------------------------------------------

def max_run(form):
    best = run = 1
    for a, b in zip(form, form[1:]):
        run = run + 1 if a == b else 1
        best = max(best, run)
    return best


def triple_splits(form, known):
    """True if every triple-letter run in form splits into two known forms."""
    for i in range(len(form) - 2):
        if form[i] == form[i + 1] == form[i + 2]:
            # the run form[i:i+3]: left part keeps two letters, right part
            # keeps one (schiff|fahrt) or left keeps one... (stress|stoornis)
            left, right = form[:i + 2], form[i + 2:]
            left2, right2 = form[:i + 1], form[i + 1:]
            if not ((len(left) >= 3 and len(right) >= 3 and left in known and right in known)
                    or (len(left2) >= 3 and len(right2) >= 3 and left2 in known
                        and right2 in known)):
                return False
    return True


def spelling_version():
    import subprocess
    try:
        out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", SPELLING_PACKAGE],
                             capture_output=True, text=True, check=True).stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        out = ""
    return out or "(version unknown)"


def wordlist_for(lang):
    import wordfreq
    # iter_wordlist('da', 'large') silently falls back to the *Norwegian*
    # list (nearest language match), so ask which languages really have one.
    return "large" if lang in wordfreq.available_languages("large") else "best"


def load_tag_cache(path, lang):
    """HanTa's readings per form from an earlier run (--tag-cache), to re-run the
    later steps quickly.  The cache holds exactly what tagging returned."""
    import json
    if not path or not os.path.exists(f"{path}.{lang}"):
        return {}
    with open(f"{path}.{lang}", encoding="utf-8") as f:
        return {k: tuple(v) for k, v in json.load(f).items()}


def save_tag_cache(path, lang, cache):
    import json
    if path:
        with open(f"{path}.{lang}", "w", encoding="utf-8") as f:
            json.dump(cache, f, ensure_ascii=False)


def build(lang, outdir, tag_cache=None):
    import wordfreq
    cfg = LANGS[lang]
    wl = wordlist_for(lang)
    alphabet = set(ALPHABET[lang])
    vowels = set(VOWELS[lang])
    t0 = time.time()

    raw = 0
    stage1 = []  # (form, freq) passing rules 1-4, 6, 7, in wordfreq order
    seen = set()
    dropped = dict(alphabet=0, single=0, novowel=0, two=0, run=0, abbrev=0, fragment=0)
    for w in wordfreq.iter_wordlist(lang, wordlist=wl):
        raw += 1
        form = unicodedata.normalize("NFC", w)
        if form in seen:
            continue
        if not form or any(c not in alphabet for c in form):
            dropped["alphabet"] += 1
            continue
        if len(form) == 1:
            dropped["single"] += 1
            continue
        if not any(c in vowels for c in form):
            dropped["novowel"] += 1
            continue
        freq = max(1, round(wordfreq.word_frequency(form, lang, wordlist=wl) * 1e9))
        if len(form) == 2 and freq < TWO_LETTER_MIN and form not in ALLOW_TWO[lang]:
            dropped["two"] += 1
            continue
        if form in ABBREVIATIONS[lang]:
            dropped["abbrev"] += 1
            continue
        if form in FRAGMENTS[lang]:
            dropped["fragment"] += 1
            continue
        seen.add(form)
        stage1.append((form, freq))

    known = {f for f, _ in stage1 if max_run(f) < 3}
    entries = []
    for form, freq in stage1:
        r = max_run(form)
        if r >= 4 or (r == 3 and not triple_splits(form, known)):
            dropped["run"] += 1
            continue
        entries.append((form, freq))
    candidates = len(entries)
    # Highest frequency first, ties by form, so the files diff stably.
    entries.sort(key=lambda e: (-e[1], e[0]))
    if cfg["max_entries"] is not None:
        entries = entries[:cfg["max_entries"]]
    print(f"[{lang}] wordlist={wl} raw={raw} kept={len(entries)} of {candidates} "
          f"dropped={dropped} ({time.time() - t0:.0f}s)", file=sys.stderr, flush=True)

    tagger = None
    sharp_s = None
    pos_counts = {}
    if cfg["tagger"]:
        tagger = GermanTagger(cfg["tagger"]) if lang == "de" else Tagger(lang, cfg["tagger"])
    lines = []
    second = 0
    tagged = []
    plural_readings = 0
    combining_readings = 0
    cache = load_tag_cache(tag_cache, lang)
    for i, (form, freq) in enumerate(entries):
        if form in cache:
            readings, score = cache[form]
        else:
            readings = tagger.readings(form) if tagger is not None else []
            score = getattr(tagger, "last_score", None)
            cache[form] = (readings, score)
        tagged.append((form, freq, second_reading_rule([finish_reading(r) for r in readings]), score))
        if tagger is not None and i and i % 50_000 == 0:
            print(f"[{lang}] tagged {i} ({time.time() - t0:.0f}s)", file=sys.stderr, flush=True)
    save_tag_cache(tag_cache, lang, cache)
    if lang == "de":
        # HanTa's lemma of a form it does not know is a guess (App -> Ap):
        # unknown forms keep no lemma and are not marked inflected.
        tagged = [(f, q, [strip_lemma(r) for r in rs] if is_unknown(sc) else rs, sc)
                  for f, q, rs, sc in tagged]
        lemmas = {r["lemma"].lower() for _, _, rs, _ in tagged for r in rs if r.get("lemma")}
        kept = []
        sharp_s = SharpS(SPELLING_DIC, SPELLING_AFF)
        for e in tagged:
            form, _, readings, score = e
            if (len(form) <= UNKNOWN_MAX_LEN and is_unknown(score) and form not in lemmas
                    and form not in sharp_s.known):
                dropped["unknown"] = dropped.get("unknown", 0) + 1
                continue
            vowelless = [r for r in readings if vowelless_lemma(r, vowels)]
            if vowelless:
                dropped["vowelless lemma"] = dropped.get("vowelless lemma", 0) + 1
                readings = [r for r in readings if not vowelless_lemma(r, vowels)]
                if not readings:
                    continue
                e = (form, e[1], readings, score)
            if len(form) <= STRAY_VERB_MAX_LEN:
                rest = [r for r in readings if not stray_verb(r, sharp_s.known)]
                if len(rest) < len(readings):
                    dropped["stray verb"] = dropped.get("stray verb", 0) + 1
                    if not rest:
                        continue
                    e = (form, e[1], rest, score)
            kept.append(e)
        print(f"[{lang}] dropped the verb reading of {dropped.get('stray verb', 0)} short forms "
              "whose lemma the spelling dictionary does not list", file=sys.stderr, flush=True)
        print(f"[{lang}] dropped {dropped.get('unknown', 0)} unknown short forms",
              file=sys.stderr, flush=True)
        nouns = noun_lemmas(kept)
        tagged = [nominalised_adjective(with_lemma_reading(e, nouns)) for e in kept]
        tagged, plural_readings = with_dictionary_plurals(tagged, *plural_flags(SPELLING_DIC))
        print(f"[{lang}] added a noun reading to {plural_readings} regular plurals",
              file=sys.stderr, flush=True)
        tagged, combining_readings = with_combining_forms(tagged, combining_forms(SPELLING_DIC))
        print(f"[{lang}] combining forms on {combining_readings} noun readings",
              file=sys.stderr, flush=True)
    lexicalised = load_lexicalised() if lang == "de" else set()
    if lexicalised:
        known_forms = {f for f, _, _, _ in tagged}
        missing = sorted(w for w in lexicalised if w not in known_forms)
        if missing:
            print(f"[{lang}] not in the word list, so not tagged lexicalised: {', '.join(missing)}",
                  file=sys.stderr, flush=True)
        # the listed form's readings, and readings of its inflected forms
        # (Bäckereien, lemma Bäckerei)
        def mark(form, r):
            lemma = fold_ss(r["lemma"].lower()) if r.get("lemma") else None
            return dict(r, lexicalised=True) if form in lexicalised or lemma in lexicalised else r
        tagged = [(f, q, [mark(f, r) for r in rs], sc) for f, q, rs, sc in tagged]
    entries = [(f, q) for f, q, _, _ in tagged]
    if lang != "de":
        sharp_s = None
    respelled = 0
    for form, freq, readings, _ in tagged:
        written = form
        if sharp_s is not None:
            written = sharp_s.respell(form)
            respelled += written != form
            readings = [dict(r, lemma=sharp_s.respell(r["lemma"])) if r.get("lemma") else r
                        for r in readings]

        def shown(r):
            return written[0].upper() + written[1:] if lang == "de" and r["pos"] == "noun" else written

        if readings:
            first = readings[0]
            pos_counts[first["pos"]] = pos_counts.get(first["pos"], 0) + 1
            lines.append(f"{shown(first)}\t{freq}\t" + ";".join(reading_tags(first)))
            # Further readings: a line without a frequency (the loader keeps it
            # as another reading of the same entry; frequencies add up).
            for r in readings[1:]:
                lines.append(f"{shown(r)}\t" + ";".join(reading_tags(r)))
                second += 1
        else:
            lines.append(f"{written}\t{freq}")
    if sharp_s is not None:
        print(f"[{lang}] ß restored in {respelled} forms", file=sys.stderr, flush=True)

    abbr = sorted(ABBREVIATIONS[lang])
    frag = sorted(FRAGMENTS[lang])
    fmt = dict(
        alphabet="".join(ALPHABET[lang]), vowels=VOWELS[lang], two_min=f"{TWO_LETTER_MIN:,}",
        allow2=", ".join(sorted(ALLOW_TWO[lang])), n_abbr=len(abbr),
        abbr_ex=", ".join(abbr[:8]) + " ...", n_frag=len(frag),
        frag_ex=", ".join(frag[:8]) + " ...",
        limit=(f"at most {cfg['max_entries']:,} entries, highest frequency first"
               if cfg["max_entries"] else "no entry limit: every form that passes is kept"))
    hanta_v = metadata.version("HanTa") if tagger else None
    header = [
        f"# juncture lexicon: {cfg['name']} ({lang})",
        "# format: form<TAB>frequency<TAB>tags; frequency = occurrences per billion words (>= 1);",
        "#   tags = key=value pairs separated by ';' (column omitted when empty)",
        f"# source: wordfreq {metadata.version('wordfreq')} (PyPI), wordlist '{wl}', frequencies from word_frequency()",
        "# data licence: CC BY-SA 4.0 (https://creativecommons.org/licenses/by-sa/4.0/);",
        "#   derived from wordfreq by Robyn Speer (https://doi.org/10.5281/zenodo.7199437), which includes",
        "#   data from Wikipedia, OpenSubtitles, SUBTLEX (Brysbaert et al.; freely available data),",
        "#   Google Books Ngrams, the Leeds Internet Corpus, ParaCrawl, OSCAR and Twitter; see lexicons/README.md",
    ]
    if tagger:
        header += [
            f"# tags: pos=noun|verb|adj|adv|other and proper=yes from HanTa {hanta_v} model {cfg['tagger']}",
            "#   (HanTa is LGPL-3.0-or-later; only its labels are stored here)",
        ]
        if lang == "de":
            header += [
                "#   German: lemma=FORM (HanTa's lemma, where it differs from the form) and inflected=yes",
                "#   (a finite verb or inflected adjective form); a line without a frequency is a further",
                "#   reading of the form above it (noun and non-noun readings of one case-folded form)",
                "#   German nouns are written capitalised; wordfreq folds ß to ss (strasse); ß is written",
                f"#   back where the spelling dictionary {SPELLING_PACKAGE} {spelling_version()} ({SPELLING_DIC},",
                f"#   GPL-2+; only its choice between ß and ss is used) says so: {respelled} forms",
            ]
    else:
        header.append("# tags: none (no offline part-of-speech model for this language on PyPI)")
    header.append("# filters:")
    header += ["#   - " + s.format(**fmt) for s in FILTER_SUMMARY]
    if lang == "de":
        header.append(f"#   - forms of at most {UNKNOWN_MAX_LEN} letters that HanTa does not know (best score below "
                      f"{UNKNOWN_SCORE:g} on both spellings), that are not the lemma of a known form and that "
                      f"the spelling dictionary {SPELLING_PACKAGE} does not list dropped "
                      f"({dropped.get('unknown', 0)} forms)")
        header.append(f"#   - verb readings of forms of at most {STRAY_VERB_MAX_LEN} letters whose lemma the spelling "
                      f"dictionary does not list (ren: lemma ger) dropped, with the form when it has no other "
                      f"reading ({dropped.get('stray verb', 0)} forms)")
        header.append(f"#   - readings whose lemma has no vowel (lte: lemma lt, Mme: lemma Mm; an abbreviation "
                      f"read as a stem) dropped, with the form when it has no other reading "
                      f"({dropped.get('vowelless lemma', 0)} forms)")
        header.append(f"#   - a noun's regular plural in -n/-en made a form of it (lemma: the noun, on its noun "
                      f"readings without a lemma or on an added noun reading) where HanTa reads it only as "
                      f"another word (spinnen, waren: verbs), as a noun of its own (Kanten) "
                      f"or as a form of another noun (Ecken: Eck), where the spelling dictionary's affix flags "
                      f"give the noun that plural and do not make the plural a noun of its own (Posten) "
                      f"and the plural is not read as a name (Rügen) "
                      f"({plural_readings} forms)")
        header.append(f"#   - combining=FORM|FORM on noun readings: the forms the spelling dictionary gives the noun "
                      f"as a compound's first member (its flags i/j, its forms flagged h, the first members of its "
                      f"own compounds that split one way only: Kind: kind|kinder|kindes|kinds) "
                      f"({combining_readings} readings)")
        header.append(f"#   - lexicalised=yes on every reading of the forms in lexicons/{LEXICALISED_FILE} "
                      "(a hand list, from memory) and on readings whose lemma is one of them")
    header.append(f"# entries: {len(entries)} (from {raw} in the wordfreq list)"
                  + (f"; {second} further reading lines" if second else ""))
    header.append(f"# command: python3 scripts/build_lexicons.py --lang {lang}"
                  "  (after: pip install wordfreq==3.1.1 HanTa==1.2.1 numpy"
                  + (f"; apt-get install {SPELLING_PACKAGE} {SPELLING_TOOLS_PACKAGE}" if lang == "de" else "") + ")")
    out = os.path.join(outdir, cfg["file"])
    with open(out, "w", encoding="utf-8", newline="\n") as f:
        f.write("\n".join(header + lines) + "\n")
    print(f"[{lang}] wrote {out}: {len(entries)} entries, pos={pos_counts} "
          f"({time.time() - t0:.0f}s)", file=sys.stderr, flush=True)
    return len(entries)


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--lang", nargs="+", choices=list(LANGS), default=list(LANGS))
    ap.add_argument("--out", default=os.path.join(os.path.dirname(here), "lexicons"))
    ap.add_argument("--tag-cache", metavar="PATH",
                    help="keep HanTa's readings in PATH.LANG (JSON) and reuse them on the "
                         "next run; the output is the same with or without it")
    args = ap.parse_args()

    v = metadata.version("wordfreq")
    if v != WORDFREQ_VERSION:
        sys.exit(f"wordfreq {WORDFREQ_VERSION} is required (found {v}): "
                 f"pip install wordfreq=={WORDFREQ_VERSION}")
    if any(LANGS[l]["tagger"] for l in args.lang):
        try:
            hv = metadata.version("HanTa")
        except metadata.PackageNotFoundError:
            sys.exit(f"HanTa is required for tagging: pip install HanTa=={HANTA_VERSION} numpy")
        if hv != HANTA_VERSION:
            print(f"warning: HanTa {HANTA_VERSION} expected, found {hv}; tags may differ",
                  file=sys.stderr)

    if "de" in args.lang and not os.path.exists(SPELLING_DIC):
        sys.exit(f"{SPELLING_DIC} is required for German ß spellings: "
                 f"apt-get install {SPELLING_PACKAGE} {SPELLING_TOOLS_PACKAGE}")
    os.makedirs(args.out, exist_ok=True)
    for lang in args.lang:
        build(lang, args.out, args.tag_cache)


if __name__ == "__main__":
    main()
