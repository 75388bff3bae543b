# The desk's words in English, in the desk's bundle only (the phone's bundle never
# carries them): the desk's page and sign-in, review, live animals, samples, carcasses,
# people, figures and downloads. Same rules as app.ftl; ids differ from app.ftl's.

## The desk's page and sign-in (desk)

desk-title = wrackline · desk
desk-urgent = Live animals
desk-samples = Samples
desk-people = People
desk-record = Record a find
desk-checking = checking your sign-in…
sign-in-heading = Sign in
sign-in-username = Username
sign-in-password = Password
sign-in-button = Sign in

## Live animals for responders (desk)

urgent-heading = Live animals
urgent-keep-back = Keep back, and keep dogs and people back: a shark can bite and a ray's spine can sting, even when it seems weak.
urgent-local-rules = Local rules and the directions of the responders in charge come first. Watch the tide.
urgent-none = No live animals reported.
urgent-awaiting = awaiting a response
urgent-answered = response logged
urgent-unnamed = unnamed
urgent-within = { " " }(within { $metres } m)
urgent-no-place = no position given
urgent-map = open in the map app
urgent-web-map = OpenStreetMap
urgent-finder-wrote = The finder wrote: “{ $notes }”
urgent-nothing-written = The finder wrote nothing more.
urgent-finder = Finder: { $name } · { $contact }
urgent-no-name = no name given
urgent-no-contact = no contact given
urgent-not-told = No notification channel is set up for the responders.
urgent-photo = photo { $number } of the animal
urgent-time = seen { $seen } · received { $received }
urgent-log = Log a response
urgent-close-form = Close the form
urgent-reload = Refresh

## A live animal's responses (desk)

response-log-heading = Response log
response-none = No response logged yet.
response-went = : { $who } went, { $at }
response-logged-by = { " " }(logged by { $who } on { $at })
response-who = Who went
response-when = When they reached it (or stopped looking)
response-outcome = Outcome
response-choose = choose…
response-notes = Notes
response-save = Log the response
response-saved = Response logged.
outcome-returned-to-sea = returned to sea
outcome-died = died
outcome-euthanised = euthanised by a vet
outcome-not-found = not found
outcome-carcass-removed = carcass removed
on-record-live = A live animal
on-record-caution = Whoever goes: keep back from it, do not push it back to sea unless trained, and follow the responders in charge and local rules.
