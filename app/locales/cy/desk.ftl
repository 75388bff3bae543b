# Geiriau'r ddesg yn Gymraeg (Welsh), in the desk's bundle only.
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected in
# Welsh before use. Same rules as app.ftl.

## The desk's page and sign-in (desk)

desk-title = wrackline · desg
desk-urgent = Anifeiliaid byw
desk-samples = Samplau
desk-people = Pobl
desk-record = Cofnodi canfyddiad
desk-checking = yn gwirio eich mewngofnodi…
sign-in-heading = Mewngofnodi
sign-in-username = Enw defnyddiwr
sign-in-password = Cyfrinair
sign-in-button = Mewngofnodi

## Live animals for responders (desk)

urgent-heading = Anifeiliaid byw
urgent-keep-back = Cadwch draw, a chadwch gŵn a phobl draw: gall siarc frathu a gall pigyn morgath bigo, hyd yn oed pan fo'n ymddangos yn wan.
urgent-local-rules = Rheolau lleol a chyfarwyddiadau'r ymatebwyr sy'n gyfrifol sy'n dod gyntaf. Gwyliwch y llanw.
urgent-none = Dim anifeiliaid byw wedi'u hadrodd.
urgent-awaiting = yn aros am ymateb
urgent-answered = ymateb wedi'i gofnodi
urgent-unnamed = heb enw
urgent-within = { " " }(o fewn { $metres } m)
urgent-no-place = dim safle wedi'i roi
urgent-map = agor yn yr ap mapiau
urgent-web-map = OpenStreetMap
urgent-finder-wrote = Ysgrifennodd y canfyddwr: “{ $notes }”
urgent-nothing-written = Ni ysgrifennodd y canfyddwr ddim mwy.
urgent-finder = Canfyddwr: { $name } · { $contact }
urgent-no-name = dim enw wedi'i roi
urgent-no-contact = dim cyswllt wedi'i roi
urgent-not-told = Does dim sianel hysbysu wedi'i gosod ar gyfer yr ymatebwyr.
urgent-photo = llun { $number } o'r anifail
urgent-time = gwelwyd { $seen } · derbyniwyd { $received }
urgent-log = Cofnodi ymateb
urgent-close-form = Cau'r ffurflen
urgent-reload = Adnewyddu

## A live animal's responses (desk)

response-log-heading = Cofnod ymateb
response-none = Dim ymateb wedi'i gofnodi eto.
response-went = : aeth { $who }, { $at }
response-logged-by = { " " }(cofnodwyd gan { $who } ar { $at })
response-who = Pwy aeth
response-when = Pryd y cyraeddon nhw (neu pryd y rhoeson nhw'r gorau i chwilio)
response-outcome = Canlyniad
response-choose = dewiswch…
response-notes = Nodiadau
response-save = Cofnodi'r ymateb
response-saved = Ymateb wedi'i gofnodi.
outcome-returned-to-sea = wedi'i ddychwelyd i'r môr
outcome-died = bu farw
outcome-euthanised = wedi'i ddifa gan filfeddyg
outcome-not-found = heb ei ganfod
outcome-carcass-removed = corff wedi'i symud
on-record-live = Anifail byw
on-record-caution = Pwy bynnag sy'n mynd: cadwch draw ohono, peidiwch â'i wthio yn ôl i'r môr oni bai eich bod wedi'ch hyfforddi, a dilynwch yr ymatebwyr sy'n gyfrifol a'r rheolau lleol.

## Samples (desk)

samples-heading = Samplau
samples-none = Dim samplau eto.
samples-line = { $code } · { $kind } · { $preservation } · yn cael ei gadw yn { $stored_at } · gyda { $held_by }{ $notes } (ychwanegwyd gan { $added_by } ar { $added_at }{ $changed })
samples-changed-at = ; newidiwyd { $at }
samples-kind = Math
samples-code = Rhif adnabod neu god bar y sampl (teipiwch neu sganiwch)
samples-preservation = Sut y'i cedwir
samples-stored-at = Ble mae'n cael ei gadw
samples-held-by = Pwy sydd â hi
samples-add = Ychwanegu'r sampl
samples-save-change = Cadw'r newid
samples-change = Newid
samples-cancel = Canslo'r newid
samples-added = Sampl wedi'i ychwanegu.
samples-changed = Sampl wedi'i newid.
samples-add-legend = Ychwanegu sampl
samples-change-legend = Newid sampl { $code }
sample-kind-tissue = meinwe ar gyfer geneteg
sample-kind-vertebrae = fertebrâu
sample-kind-stomach-contents = cynnwys y stumog
sample-kind-whole-carcass = corff cyfan
sample-kind-other = arall
preservation-ethanol = mewn ethanol
preservation-frozen = wedi'i rewi
preservation-dried = wedi'i sychu
preservation-formalin = mewn fformalin
preservation-other = arall

## Carcass and necropsy (desk)

carcass-heading = Y corff ac archwiliad post-mortem
carcass-none = Dim wedi'i gofnodi am y corff eto.
carcass-fate = Beth ddigwyddodd i'r corff
carcass-examined = Archwiliwyd ar (gadewch yn wag os na chafodd ei archwilio)
carcass-condition = Cyflwr y corff
carcass-stomach = Stumog
carcass-injuries = Anafiadau: clwyfau, bachau, olion rhwydi, clefyd
carcass-notes = Canfyddiadau a nodiadau eraill
carcass-not-said = heb ei gofnodi
carcass-save = Cadw adroddiad y corff
carcass-saved = Adroddiad y corff wedi'i gadw.
carcass-shown-fate = tynged: { $value }
carcass-shown-examined = archwiliwyd: { $value }
carcass-shown-condition = cyflwr y corff: { $value }
carcass-shown-stomach = stumog: { $value }
carcass-shown-injuries = anafiadau: { $value }
carcass-shown-notes = nodiadau: { $value }
carcass-recorded-by = cofnodwyd gan { $who } ar { $at }
fate-left-where-found = wedi'i adael lle cafwyd hyd iddo
fate-buried = wedi'i gladdu
fate-removed-for-disposal = wedi'i symud i'w waredu
fate-taken-for-study = wedi'i gymryd i'w astudio
fate-washed-away = wedi'i olchi i ffwrdd
fate-unknown = ddim yn hysbys
body-condition-good = da
body-condition-fair = gweddol
body-condition-poor = gwael
body-condition-emaciated = tenau iawn
stomach-empty = gwag
stomach-some-food = ychydig o fwyd
stomach-full = llawn
stomach-not-examined = heb ei archwilio

## Finding an animal by a sample (desk)

lookup-heading = Dod o hyd i anifail drwy sampl
lookup-hint = Teipiwch rif adnabod y sampl, neu sganiwch ei god bar i'r blwch.
lookup-code = Rhif adnabod neu god bar y sampl
lookup-find = Chwilio
lookup-the-sample = Y sampl hwn
lookup-the-animal = Yr anifail
lookup-all-samples = Pob sampl o'r anifail hwn
lookup-trail = Newidiadau
lookup-seen = gwelwyd { $at } yn { $place }
lookup-record = cofnod { $id }
lookup-carcass = Corff: { $fate } (cofnodwyd gan { $who } ar { $day })

## Review states (desk)

state-awaiting-review = yn aros am adolygiad
state-details-requested = gofynnwyd am fanylion
state-confirmed = wedi'i gadarnhau
state-not-confirmable = methu ei gadarnhau
state-merged = wedi'i gyfuno

## Range and trend figures (desk)

figures-heading = Dosbarthiad a thuedd
figures-caveat = Mewnbynnau i asesiad o rywogaethau dan fygythiad yw'r ffigurau hyn, nid penderfyniad rhestru: mae'r broses asesu swyddogol yn eu pwyso ochr yn ochr â'r holl dystiolaeth arall.
figures-taxon = Tacson (rhywogaeth, genws, teulu…)
figures-records = Cofnodion
figures-confirmed-only = wedi'u cadarnhau yn unig
figures-all-records = pob un, wedi'i adolygu neu beidio
figures-first-period = Cyfnod cyntaf
figures-first-period-example = e.e. 2015-2019
figures-second-period = Ail gyfnod
figures-second-period-example = e.e. 2020-2024
figures-generation = Hyd cenhedlaeth, mewn blynyddoedd (os nad oes un yn y rhestr wirio)
figures-show = Dangos
figures-choose = dewiswch dacson a phwyswch Dangos
figures-range-empty = Dim cofnodion â safle i weithio ohonynt ({ $used }). Mae cofnodion yn cyfrif unwaith y bydd adolygwyr yn eu cadarnhau; dewiswch "pob un, wedi'i adolygu neu beidio" dan Cofnodion i weld pob cofnod sydd wedi'i gadw.
figures-eoo-raised = { " " }Codwyd yr EOO i'r AOO am fod y cragen yn llai (IUCN Guidelines §4.9).
figures-range-of = Dosbarthiad { $name }
figures-records-used = Cofnodion a ddefnyddiwyd: { $used }.
figures-figure = Ffigur
figures-change = Newid
figures-range-method = EOO: arwynebedd y polygon amgrwm lleiaf o amgylch y cofnodion, geodesig ar WGS84 (wedi'i godi i'r AOO pan fo'n llai). AOO: celloedd 2 × 2 km â chofnod × 4 km². AOO lleiaf: y nifer lleiaf o gelloedd â chofnod dros 16 tarddbwynt grid wedi'u symud chwarter cell. Safleoedd: safleoedd o leiaf tua 10 m oddi wrth ei gilydd.
figures-criterion-b = Maen prawf B
figures-trend-years = Tuedd { $first }–{ $last }
figures-criterion-a = Maen prawf A
figures-map-heading = Ble: cofnodion, y cragen (EOO) a chelloedd 2 × 2 km â chofnod (AOO)
figures-chart-heading = Cyfradd canfod fesul blwyddyn
figures-chart-hint = Anifeiliaid fesul km a gerddwyd ar deithiau lle cofnodwyd pob canfyddiad (fesul blwyddyn lle nad oes taith o'r fath wedi'i chadw), gyda'r duedd a ffitiwyd a'i band 95%.
figures-recording-caution = Mae cofnodion o'r lan ac o lanfeydd yn dangos ble mae pobl yn cerdded, yn pysgota ac yn adrodd, a ble mae cerhyntau'n cario cyrff; nid bwlch yn y dosbarthiad yw bwlch yn y cofnodion.

## Review (desk)

review-heading = Adolygu
review-decisions-kept = Caiff penderfyniadau eu cadw gyda phwy a'u gwnaeth a phryd.
zoom-label = llun, y gellir ei chwyddo
zoom-fit = Ffitio
zoom-original = Y gwreiddiol (gydag EXIF)
zoom-close = Cau
zoom-image = y llun, yn fawr
review-sign-out = Allgofnodi
queue-filters =
    Hidlau{ $set ->
        [0] {""}
       *[other] { " " }({ $set } wedi'u gosod)
    }
queue-show = Dangos
queue-to-review = i'w hadolygu
queue-all = y cyfan
queue-taxon = Rhywogaeth neu grŵp
queue-taxon-example = e.e. Rajidae, ci glas
queue-area = Ardal
queue-anywhere = unrhyw le
queue-from = O
queue-to = I
queue-flag = Baner
queue-any-flag = unrhyw un neu ddim
queue-filter = Hidlo
queue-clear = Clirio
queue-count =
    { $count ->
        [one] 1 cofnod
       *[other] { $count } cofnod
    }{ $more }
queue-more-below = , mwy isod
queue-load-more = Llwytho mwy
flag-oversize = rhy fawr
flag-out-of-range = y tu allan i'w ddosbarthiad
flag-possible-duplicate = dyblygiad posibl
flag-photo-older = llun yn hŷn na'r cofnod
flag-photo-far = llun ymhell o'r cofnod
duplicates-heading = Yr un anifail, o bosibl
duplicates-none = Does dim adroddiad arall yn edrych fel yr un anifail.
duplicates-length = { $cm } cm { $kind }
duplicates-no-length = dim hyd
duplicates-photo = llun o'r adroddiad arall
duplicates-score = sgôr cyfateb { $score } o 1
duplicates-apart = { " " }· { $distance } · { $hours } awr rhyngddynt · { $here } yma, { $there } yno
duplicates-metres-apart = { $metres } m oddi wrth ei gilydd
duplicates-distance-unknown = pellter yn anhysbys
duplicates-other = { $what } ar { $at } · { $state }
duplicates-decided = Penderfynwyd: { $decision }
duplicates-same = Yr un anifail
duplicates-different = Anifeiliaid gwahanol
duplicates-undo = Dadwneud y cyfuno

## One record under review (desk)

record-back = ← Yn ôl i'r ciw
record-no-offset = { $time } (dim gwrthbwys)
record-within = o fewn { $metres } m
record-photo = llun { $number }
record-photo-file-exif = llun { $number } (EXIF y ffeil)
record-photo-phone-exif = llun { $number } (darlleniad y ffôn o'r gwreiddiol)
record-no-exif-time = dim amser EXIF
record-no-exif-place = dim lle EXIF
record-taken-before = tynnwyd { $gap } cyn y cofnod
record-taken-after = tynnwyd { $gap } ar ôl y cofnod
record-from-place = { $distance } o le'r cofnod
record-flag-cut-short = ffeil y llun wedi'i thorri'n fyr: mae rhan o'r llun ar goll
record-photo-check = llun { $number } ({ $reading }): { $facts }
record-key-heading = Yr allwedd dywys
record-key-picked = Dewisodd y sylwedydd { $name } ({ $rank }, { $percent }% wrth ei ddewis).
record-key-now = Beth mae'r allwedd yn ei awgrymu ar gyfer yr atebion hyn nawr, y mwyaf tebygol yn gyntaf:
record-photo-alt = llun { $number } o'r cofnod: tapiwch i'w agor yn fawr
record-no-guess = dim dyfaliad
record-no-name = sylwedydd na roddodd enw
record-sent-by = Anfonwyd gan { $name } · { $contact }
record-guess = Dyfaliad y sylwedydd: { $guess }
record-name-reading = Enw “{ $typed }” → { $reading }. Lle cyhoeddus: { $place }
record-contact-use = { " " }(mae'r cyswllt ar gyfer cwestiynau am y cofnod hwn yn unig; ni chaiff byth ei allforio)
record-map = map o ble gwnaed y cofnod a'i luniau
record-when = pryd
record-where = ble
record-device = dyfais
record-fields = nifer { $count } · { $condition } · { $setting } · rhyw { $sex }
record-length = { $cm } cm { $kind } ({ $method })
record-signs = olion: { $signs }
record-observer = sylwedydd: { $name }
record-flags-heading = Baneri a blaenoriaeth
record-identifications = Adnabyddiaethau
record-identification = { $name } ({ $rank }) gan { $who } ar { $day } [{ $basis }]{ $remarks }
record-no-rank = dim rheng wedi'i rhoi
record-messages = Negeseuon
record-history = Hanes
record-event = { $at } { $from } → { $to } gan { $who }: { $detail }{ $reason }
record-decide = Penderfynu
record-scientific-name = Enw gwyddonol
record-rank = Rheng
record-remark = Sylw
record-confirm = Cadarnhau
record-message = Neges i'r sylwedydd, neu'r rheswm
record-ask = Gofyn i'r sylwedydd
record-not-confirmable = Methu ei gadarnhau
record-message-hint = Caiff y neges, neu'r rheswm dros “methu ei gadarnhau”, ei hanfon i ffôn y sylwedydd.

## People (desk, admins)

people-hint = Does dim angen i sylwedyddion fewngofnodi: mae eu ffôn yn cael ei hunaniaeth ei hun. Nid yw cysylltiadau byth yn gadael y gweinydd.
people-sign-in-first = { $problem } (mewngofnodwch fel gweinyddwr dan Adolygu yn gyntaf)
people-now-role = Rôl { $who } bellach: { $role }.
people-new-password = Mae gan { $who } gyfrinair newydd; daeth eu sesiynau i ben.
people-turned-off = Mae mewngofnodi { $who } wedi'i ddiffodd.
people-turned-on = Mae mewngofnodi { $who } wedi'i droi ymlaen.
people-off-mark = { " " }· wedi'i ddiffodd
people-role = Rôl
people-new-password-label = Cyfrinair newydd
people-set-password = Gosod cyfrinair
people-turn-on = Troi ymlaen
people-turn-off = Diffodd
people-add-legend = Ychwanegu person
people-name-shown = Enw a ddangosir
people-password = Cyfrinair (10+ nod)
people-add = Ychwanegu
people-added = Ychwanegwyd { $who } fel { $role }. Rhowch eu cyfrinair iddyn nhw wyneb yn wyneb; maen nhw'n mewngofnodi dan Adolygu.
people-changes = Newidiadau i fewngofnodi
people-event = { $at } · { $who } · { $action } · gan { $by }
people-command-line = llinell orchymyn y gweinydd
people-back = ← Adolygu
role-observer = sylwedydd
role-reviewer = adolygydd
role-admin = gweinyddwr
role-responder = ymatebwr

## Downloads (desk)

downloads-heading = Lawrlwytho cofnodion
downloads-public-form = Mae'r ffurf gyhoeddus yn cyffredinoli rhywogaethau sensitif (Chapman 2020, GBIF): mae eu safleoedd wedi'u talgrynnu neu eu dal yn ôl, ac maen nhw'n dweud hynny. Nid yw cysylltiadau sylwedyddion byth yn cael eu cynnwys.
downloads-format = Fformat
downloads-dwca = Archif Darwin Core (zip)
downloads-csv = CSV
downloads-geojson = GeoJSON
downloads-taxon = Tacson (gwag: y cyfan)
downloads-full = { " " }Ffurf lawn: safleoedd fel y'u cofnodwyd, gan gynnwys rhywogaethau sensitif (adolygwyr a gweinyddwyr yn unig; peidiwch â'i rhannu)
downloads-download = Lawrlwytho
downloads-state-confirmed = Yn cyfrif cofnodion wedi'u cadarnhau yn unig: y rhai y mae adolygydd wedi'u gwirio.
downloads-state-any = Yn cyfrif pob cofnod sydd wedi'i gadw, wedi'i adolygu neu beidio: gall cofnodion heb eu cadarnhau fod yn anghywir.
downloads-state-other = Yn cyfrif cofnodion yn y cyflwr “{ $state }” yn unig.

## Built in data/ (desk)

# Tabl y ffigurau (data/figures.rs). Mae EOO ac AOO yn cadw enwau'r IUCN.
figures-row-records = Cofnodion
figures-row-sites = Safleoedd gwahanol
figures-row-eoo = EOO
figures-row-aoo = AOO
figures-row-least-aoo = AOO lleiaf (gridiau wedi'u symud)
figures-area = { $area } km²
figures-area-change-percent = { $area } km² ({ $percent }%)
figures-percent = { $percent }%
figures-percent-over = dros +{ $limit }%
figures-percent-below = o dan −{ $limit }%
# Llinellau'r duedd: label, yna'i destun.
figures-rate-label = Cyfradd newid y flwyddyn
figures-window-label = Newid dros y ffenestr asesu
figures-years-fitted-label = Blynyddoedd a ffitiwyd
figures-window-chosen-label = Sut y dewiswyd y ffenestr
figures-model-label = Gwasgariad a model
figures-mann-kendall-label = Mann–Kendall (wedi'i gywiro am gydraddoldebau)
figures-counts-label = Anifeiliaid a gofnodwyd bob blwyddyn
figures-change-interval = { $change } (cyfwng 95% { $lower } i { $upper })
figures-window-change = { $change } dros { $window } o flynyddoedd
figures-window-change-extrapolated = { $change } dros { $window } o flynyddoedd, wedi'i allosod y tu hwnt i'r blynyddoedd sydd â data
figures-window-not-given = heb ei roi: mae'r ffenestr o { $window } o flynyddoedd yn ymestyn yn rhy bell y tu hwnt i'r { $span } o flynyddoedd a ffitiwyd ({ $first }–{ $last }) i gario'r duedd drosti. Rhoddir y newid y flwyddyn; mae angen rhagor o flynyddoedd o ddata ar gyfer y ffenestr.
figures-years-fitted = { $first }–{ $last } (y ffenestr asesu ddiweddaraf; ni ffitiwyd blynyddoedd cynharach)
figures-window-chosen = { $window } o flynyddoedd = yr hiraf o 10 mlynedd a 3 × hyd cenhedlaeth ({ $generation } o flynyddoedd; { $source }), maen prawf A yr IUCN
figures-model = Gwasgariad Pearson { $dispersion }; { $model }
figures-model-quasi-poisson-t = quasi-Poisson: gwallau wedi'u graddio yn ôl y gwasgariad, cyfyngau o ddosbarthiad t Student gyda { $df } gradd rhyddid
figures-model-quasi-poisson = quasi-Poisson: gwallau wedi'u graddio yn ôl y gwasgariad
figures-model-negative-binomial = binomial negatif (mae ei AIC yn is nag un y Poisson), cyfyngau o'r dosbarthiad normal
figures-model-poisson = gwallau Poisson, cyfyngau o'r dosbarthiad normal
figures-mann-kendall = tau = { $tau }, p = { $p }; llethr Sen { $slope } y flwyddyn
figures-no-counts = dim

# Ffurflenni a hysbysiadau'r bobl sy'n mynd allan (data/fieldwork.rs).
fieldwork-choose-date-time = dewiswch ddyddiad ac amser
fieldwork-choose-from-list = dewiswch un o'r rhestr
fieldwork-channel-email = e-bost
fieldwork-channel-webhook = webhook
fieldwork-notification-delivered = { $channel }: wedi'i ddanfon { $at } ar ôl { $attempts } ymgais
fieldwork-notification-failing = { $channel }: heb ei ddanfon eto ar ôl { $attempts } ymgais; methodd yr olaf: { $error }
fieldwork-notification-waiting = { $channel }: yn aros i gael ei anfon

# Darlleniadau llun, bylchau a phellteroedd ar sgrin y cofnod (data/readable.rs).
readable-time-and-place-from = amser o { $time }, lle o { $place }
readable-no-exif = dim EXIF
readable-phone-reading = darlleniad y ffôn o'r gwreiddiol
readable-file-exif = EXIF y ffeil
readable-offset-photo = gwrthbwys y llun
readable-offset-phone = gwrthbwys y ffôn ar y pryd
readable-offset-record = gwrthbwys y cofnod
readable-gap-hours = { $hours } awr
readable-gap-days = { $days } diwrnod
readable-distance-m = { $metres } m
readable-distance-km = { $km } km

# Rhyw'r anifail ar sgrin y cofnod, a newidiadau i fewngofnodi (data/labels.rs).
sex-male = gwryw
sex-female = benyw
sex-unknown = ddim yn hysbys
people-action-added = ychwanegwyd fel { $role }
people-action-role-changed = newidiwyd y rôl ({ $from } → { $to })
people-action-password-reset = ailosodwyd y cyfrinair; daeth eu sesiynau i ben
people-action-turned-off = diffoddwyd y mewngofnodi
people-action-turned-on = trowyd y mewngofnodi ymlaen

## What an identification rests on (data/labels.rs)

basis-observer-guess = dyfaliad y sylwedydd
basis-observer-key = y sylwedydd, gyda'r allwedd dywys
basis-reviewer = adolygydd

## Why a record stands where it is in the queue (data/labels.rs)

priority-live-animal = anifail byw: dim ymateb wedi'i gofnodi eto
priority-holds-species = {" "}(neu'n cynnwys rhywogaethau sydd)
priority-protected = mae { $taxon } wedi'i warchod{ $holds }
priority-sensitive = mae { $taxon } yn sensitif{ $holds }: caiff ei leoliadau cyhoeddus eu cyffredinoli
priority-possible-duplicate = efallai mai'r un anifail ag adroddiad arall yw hwn: cymharwch nhw
priority-long = amser hir
priority-far = ymhell
priority-photo-older = llun yn hŷn na'r cofnod: tynnwyd llun { $photo } { $gap } cyn y cofnod (mwy na { $limit } awr): hen lun wedi'i ailddefnyddio?
priority-photo-far = llun ymhell o'r cofnod: tynnwyd llun { $photo } { $distance } o'i le (mwy na { $limit } km y tu hwnt i'r ddau ansicrwydd)
priority-photo-cut-short = mae ffeil llun { $photo } wedi'i thorri'n fyr: mae rhan o'r llun ar goll
