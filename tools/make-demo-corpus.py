#!/usr/bin/env python3
"""Writes the bundled demo corpus: invented passenger messages to a fictional ferry operator,
"Tidewink Ferries", which runs between the invented islands Harrowmere, Oskevik, Port Lunel and
Brisholm. Four languages (English, German, French, Norwegian). Seeded, so the output is reproducible:

    python3 tools/make-demo-corpus.py OUT_DIR

writes OUT_DIR/messages-en.txt, -de.txt, -fr.txt, -no.txt (one message a line). All text here is
written for this project; it is demo data, not a measurement corpus.
"""
import os
import random
import sys

PORTS = ["Harrowmere", "Oskevik", "Port Lunel", "Brisholm", "Skarvhamn", "Little Tarrow"]
SHIPS = ["MS Kittiwake", "MS Brannoch", "MV Selkie Dawn", "MS Tern", "MV Gullrock"]
NAMES = ["Ingrid", "Tomasz", "Amélie", "Jörg", "Sunniva", "Rhiannon", "Kofi", "Łucja", "Søren", "Margaux",
         "Dagny", "Matthias", "Océane", "Björn", "Priya", "Elodie"]
ITEMS = {
    "en": ["a blue umbrella", "my reading glasses", "a child's teddy bear", "a black backpack", "a phone charger",
           "a green scarf", "my wallet", "a pair of hiking boots", "a camera bag", "a thermos flask"],
    "de": ["einen blauen Regenschirm", "meine Lesebrille", "einen Teddybären", "einen schwarzen Rucksack",
           "ein Ladekabel", "einen grünen Schal", "meine Geldbörse", "ein Paar Wanderschuhe", "eine Kameratasche",
           "eine Thermoskanne"],
    "fr": ["un parapluie bleu", "mes lunettes de vue", "un ours en peluche", "un sac à dos noir",
           "un chargeur de téléphone", "une écharpe verte", "mon portefeuille", "une paire de chaussures de randonnée",
           "un sac photo", "une bouteille isotherme"],
    "no": ["en blå paraply", "lesebrillene mine", "en kosebamse", "en svart ryggsekk", "en mobillader",
           "et grønt skjerf", "lommeboka mi", "et par fjellsko", "en kameraveske", "en termos"],
}
PLACES = {
    "en": ["on the upper deck", "in the café", "near the car deck stairs", "in the quiet lounge", "at seat row 14"],
    "de": ["auf dem Oberdeck", "im Café", "an der Treppe zum Autodeck", "in der Ruhelounge", "in Sitzreihe 14"],
    "fr": ["sur le pont supérieur", "au café", "près de l'escalier du pont garage", "dans le salon calme",
           "au rang 14"],
    "no": ["på øvre dekk", "i kafeen", "ved trappen til bildekket", "i stillesalongen", "på seterad 14"],
}

TEMPLATES = {
    "en": [
        "Hello, I booked the {time} crossing from {a} to {b} on {day} (booking {ref}) and need to change it to the next day.",
        "Is the {time} sailing from {a} delayed? The board at the terminal says {mins} minutes but the app says on time.",
        "I left {item} {place} on the {ship} yesterday afternoon. Has anyone handed it in?",
        "Can I bring my dog on the {a}–{b} route? She is small and travels in a carrier.",
        "We are {n} adults and {k} children with one car (length {len} m). What is the fare to {b}?",
        "The {ship} left {a} {mins} minutes late and we missed our bus in {b}. Can we get a refund?",
        "My wheelchair needs step-free access. Is there a lift from the car deck on the {ship}?",
        "Thank you to the crew of the {ship} for helping my father off the boat in {b} today!",
        "Booking {ref}: please add a bicycle. We travel {a} to {b} on {day} at {time}.",
        "Why was the {time} from {b} cancelled? Nobody told us at the quay and it was {temp}°C and raining.",
        "I paid twice for booking {ref} (NOK {price}.00 each time). Please refund one payment.",
        "Is there wifi on board? I need to work during the {mins}-minute crossing to {b}.",
    ],
    "de": [
        "Guten Tag, ich habe die Überfahrt um {time} von {a} nach {b} am {day} gebucht (Buchung {ref}) und möchte sie auf den nächsten Tag verschieben.",
        "Hat die Abfahrt um {time} ab {a} Verspätung? Die Anzeige im Terminal sagt {mins} Minuten, die App sagt pünktlich.",
        "Ich habe gestern Nachmittag {item} {place} der {ship} liegen lassen. Wurde etwas abgegeben?",
        "Darf ich meinen Hund auf der Strecke {a}–{b} mitnehmen? Er ist klein und reist in einer Transportbox.",
        "Wir sind {n} Erwachsene und {k} Kinder mit einem Auto (Länge {len} m). Was kostet die Fahrt nach {b}?",
        "Die {ship} ist {mins} Minuten zu spät in {a} abgefahren, und wir haben unseren Bus in {b} verpasst. Bekommen wir eine Erstattung?",
        "Mein Rollstuhl braucht einen stufenlosen Zugang. Gibt es auf der {ship} einen Aufzug vom Autodeck?",
        "Vielen Dank an die Besatzung der {ship}, die meinem Vater heute in {b} von Bord geholfen hat!",
        "Buchung {ref}: Bitte ein Fahrrad hinzufügen. Wir fahren am {day} um {time} von {a} nach {b}.",
        "Warum wurde die Fähre um {time} ab {b} gestrichen? Niemand hat uns am Kai informiert, bei {temp} °C und Regen.",
        "Ich habe für Buchung {ref} zweimal bezahlt (jeweils NOK {price},00). Bitte erstatten Sie eine Zahlung.",
        "Gibt es WLAN an Bord? Ich muss während der {mins}-minütigen Überfahrt nach {b} arbeiten.",
    ],
    "fr": [
        "Bonjour, j'ai réservé la traversée de {time} de {a} à {b} le {day} (réservation {ref}) et je voudrais la déplacer au lendemain.",
        "Le départ de {time} de {a} est-il retardé ? L'écran du terminal indique {mins} minutes mais l'appli dit à l'heure.",
        "J'ai oublié {item} {place} du {ship} hier après-midi. Quelqu'un l'a-t-il rapporté ?",
        "Puis-je emmener mon chien sur la ligne {a}–{b} ? Elle est petite et voyage dans une caisse.",
        "Nous sommes {n} adultes et {k} enfants avec une voiture ({len} m de long). Quel est le tarif pour {b} ?",
        "Le {ship} a quitté {a} avec {mins} minutes de retard et nous avons raté notre bus à {b}. Pouvons-nous être remboursés ?",
        "Mon fauteuil roulant a besoin d'un accès de plain-pied. Y a-t-il un ascenseur depuis le pont garage du {ship} ?",
        "Merci à l'équipage du {ship} qui a aidé mon père à débarquer à {b} aujourd'hui !",
        "Réservation {ref} : merci d'ajouter un vélo. Nous voyageons de {a} à {b} le {day} à {time}.",
        "Pourquoi le départ de {time} de {b} a-t-il été annulé ? Personne ne nous a prévenus sur le quai, il faisait {temp} °C sous la pluie.",
        "J'ai payé deux fois la réservation {ref} ({price},00 NOK chaque fois). Merci de rembourser un paiement.",
        "Y a-t-il du wifi à bord ? Je dois travailler pendant les {mins} minutes de traversée vers {b}.",
    ],
    "no": [
        "Hei, jeg har bestilt overfarten kl. {time} fra {a} til {b} på {day} (bestilling {ref}) og må flytte den til dagen etter.",
        "Er avgangen kl. {time} fra {a} forsinket? Tavla på terminalen sier {mins} minutter, men appen sier i rute.",
        "Jeg glemte {item} {place} på {ship} i går ettermiddag. Har noen levert det inn?",
        "Kan jeg ta med hunden på strekningen {a}–{b}? Hun er liten og reiser i bur.",
        "Vi er {n} voksne og {k} barn med én bil ({len} m lang). Hva koster billetten til {b}?",
        "{ship} gikk fra {a} {mins} minutter for sent, og vi rakk ikke bussen i {b}. Kan vi få refusjon?",
        "Rullestolen min trenger trinnfri adkomst. Finnes det heis fra bildekket på {ship}?",
        "Takk til mannskapet på {ship} som hjalp faren min i land i {b} i dag!",
        "Bestilling {ref}: legg til en sykkel, takk. Vi reiser fra {a} til {b} på {day} kl. {time}.",
        "Hvorfor ble avgangen kl. {time} fra {b} innstilt? Ingen sa fra på kaia, og det var {temp} °C og regn.",
        "Jeg betalte to ganger for bestilling {ref} (NOK {price},00 hver gang). Vennligst refunder én betaling.",
        "Er det wifi om bord? Jeg må jobbe under den {mins} minutter lange overfarten til {b}.",
    ],
}
DAYS = {
    "en": ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"],
    "de": ["Montag", "Dienstag", "Mittwoch", "Donnerstag", "Freitag", "Samstag", "Sonntag"],
    "fr": ["lundi", "mardi", "mercredi", "jeudi", "vendredi", "samedi", "dimanche"],
    "no": ["mandag", "tirsdag", "onsdag", "torsdag", "fredag", "lørdag", "søndag"],
}
SIGN = {"en": "Regards, {name}", "de": "Viele Grüße, {name}", "fr": "Cordialement, {name}", "no": "Hilsen {name}"}


def message(rng, lang):
    a, b = rng.sample(PORTS, 2)
    t = rng.choice(TEMPLATES[lang])
    text = t.format(
        a=a, b=b, ship=rng.choice(SHIPS), item=rng.choice(ITEMS[lang]), place=rng.choice(PLACES[lang]),
        time="%02d:%02d" % (rng.randrange(6, 23), rng.choice([0, 10, 15, 30, 40, 45])),
        day=rng.choice(DAYS[lang]), ref="TW-%05d" % rng.randrange(100000), mins=rng.choice([10, 15, 20, 35, 45, 90]),
        n=rng.randrange(1, 5), k=rng.randrange(0, 4), len="%.1f" % rng.uniform(3.5, 6.5),
        temp=rng.randrange(2, 14), price=rng.randrange(90, 1900))
    if rng.random() < 0.5:
        text += " " + SIGN[lang].format(name=rng.choice(NAMES))
    if rng.random() < 0.05:
        text += " \U0001F6A2"  # a ship emoji now and then
    return text


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "."
    os.makedirs(out, exist_ok=True)
    rng = random.Random(20261202)
    for lang in ["en", "de", "fr", "no"]:
        with open(os.path.join(out, "messages-%s.txt" % lang), "w", encoding="utf-8", newline="\n") as f:
            for _ in range(700):
                f.write(message(rng, lang) + "\n")


if __name__ == "__main__":
    main()
