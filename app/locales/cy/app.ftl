# Geiriau wrackline yn Gymraeg (Welsh).
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected in
# Welsh, by someone who knows the shore and stranding work, before use.
# The safety cautions and the live-animal instructions most of all.
# Every id of ../en/app.ftl is here with the same placeholders (the catalogue test checks it).

## Safety (both bundles)

safety-call-number = Anifail byw neu wedi'i olchi i'r lan? Ffoniwch yr ymatebwyr lleol: { $number }. Neu Wylwyr y Glannau.
safety-call = Anifail byw neu wedi'i olchi i'r lan? Ffoniwch yr ymatebwyr lleol i anifeiliaid môr ar y lan, neu Wylwyr y Glannau.
safety-keep-back = Cadwch draw o unrhyw anifail byw a chadwch gŵn draw. Gall siarc sy'n edrych yn farw frathu o hyd.
safety-spines = Mae'r pigau'n wenwynig, hyd yn oed ar anifail marw: pigyn y gynffon (colyn) ar forgathod â cholyn a morgathod eryr, a'r pigau o flaen esgyll y cefn ar gŵn pigog a chimaeraod. Peidiwch â gafael ynddyn nhw yno. Os cewch eich pigo: rhowch y clwyf mewn dŵr mor boeth ag y gallwch ei oddef (tua 45 °C) am o leiaf 30 munud, a cheisiwch gymorth meddygol.
safety-thorns = Mae gan gathod môr a morgathod pigog ddrain miniog ar y cefn a'r gynffon: gwisgwch fenig neu gadewch lonydd iddyn nhw.
safety-no-pushing = Peidiwch â llusgo na gwthio anifail byw sydd ar y lan yn ôl i'r môr oni bai eich bod wedi'ch hyfforddi.
safety-tide = Gwyliwch y llanw, y tonnau a'ch traed. Does dim cofnod yn werth cael eich dal gan y llanw.
safety-no-eating = Peidiwch â bwyta anifail sydd wedi'i olchi i'r lan na chymryd darnau ohono: gall fod yn anniogel, ac i rywogaethau gwarchodedig gall fod yn anghyfreithlon. Golchwch eich dwylo ar ôl cyffwrdd ag unrhyw beth.
safety-local-rules = Rheolau lleol a chyfarwyddiadau'r ymatebwyr a'r awdurdodau sy'n dod gyntaf.

## The language switch (both bundles)

language-switch = Iaith

## The phone's page (both bundles: its links and safety heading)

phone-safety-link = Diogelwch
phone-figures-link = Ffigurau
phone-review-link = Adolygu
phone-safety-heading = Diogelwch ar y traeth

## About you (words built in data modules, both bundles)

about-saved = { $named }; { $reach }{ $open_data }. Bydd yn mynd gyda'r cysoni nesaf.
about-saved-no-name = Wedi'i gadw: mae'ch cofnodion yn mynd heb enw
about-saved-as = Wedi'i gadw: mae'ch cofnodion yn mynd fel { $name }
about-saved-no-contact = dim manylion cyswllt, felly ni all adolygwyr ofyn i chi am ganfyddiad
about-saved-contact = gall adolygwyr gysylltu â chi am eich canfyddiadau; ni chaiff eich manylion cyswllt byth eu cyhoeddi
about-saved-named-in-open-data = ; mae'r data agored yn eich enwi
about-saved-anonymous-in-open-data = ; mae'r data agored yn dangos label dienw yn lle'ch enw
about-no-name = dim enw
about-no-contact = dim cyswllt
about-contact-given = cyswllt wedi'i roi

## Sync states and the outbox (words built in data modules, both bundles)

sync-draft = drafft
sync-waiting = yn aros i anfon
sync-sent = wedi'i anfon, yn aros am y gweinydd
sync-received = wedi'i dderbyn gan y gweinydd
sync-refused = heb ei dderbyn gan y gweinydd: { $problem }
sync-sending = yn anfon…
sync-retry = { $problem }; rhoi cynnig arall ymhen { $seconds } eiliad
record-unnamed = anifail heb enw
record-summary-length = , { $cm } cm { $kind }
record-summary =
    { $what }{ $length } · { $when } · { $photos ->
        [zero] dim lluniau
        [one] 1 llun
        [two] 2 lun
       *[other] { $photos } llun
    }
storage-full = Heb ei gadw: mae storfa wrackline ar y ffôn hwn yn llawn ({ $used } o { $quota } MB gyda'r cofnod hwn). Anfonwch gofnodion sy'n aros neu rhyddhewch le ar y ffôn, yna cadwch eto. Mae'ch ffurflen wedi'i chadw fel y mae.
storage-nearly-full = Rhybudd: mae storfa wrackline ar y ffôn hwn bron yn llawn ({ $used } o { $quota } MB). Anfonwch gofnodion sy'n aros yn fuan.

## Values of the shared vocabulary (both bundles)

length-total = hyd cyfan
length-fork = hyd fforch
length-precaudal = hyd cyn y gynffon
length-disc-width = lled y ddisg
length-disc-length = hyd y ddisg
condition-alive = yn fyw
condition-fresh-dead = newydd farw
condition-decomposed = wedi pydru
condition-remains-only = gweddillion yn unig
setting-beach-stranding = wedi'i olchi i'r traeth
setting-angler-catch = dalfa pysgotwr gwialen
setting-landing-site = safle glanio neu farchnad
setting-floating = yn arnofio ar y môr
setting-discarded-bycatch = sgil-ddalfa wedi'i thaflu
stage-egg-case = cas wy
stage-embryo = embryo
stage-juvenile = ifanc
stage-adult = oedolyn
sign-hook = bachyn
sign-line = lein
sign-net-marks = olion rhwyd
sign-fins-removed = esgyll wedi'u torri i ffwrdd
sign-boat-strike = wedi'i daro gan gwch

## Survey walks (words built in data modules, both bundles)

walk-walking-now = yn cerdded nawr
walk-give-times = Rhowch ddechrau a diwedd y daith.
walk-give-distance = Rhowch y pellter a gerddwyd mewn cilometrau (0 i 100).
walk-ends-before-start = Mae'r daith yn gorffen cyn iddi ddechrau.
walk-untitled = taith
walk-fix-rough = safle'n rhy fras (o fewn { $metres } m yn unig), yn aros am un gwell
walk-fix-good = safle'n hysbys o fewn { $metres } m
walk-no-fix = dim safle ({ $problem }); mae'r daith yn parhau, ond bydd ei llwybr yn fyr

## My records (words built in data modules, both bundles)

mine-awaiting = yn aros am adolygydd
mine-awaiting-means = Does dim adolygydd wedi edrych arno eto.
mine-asked = mae adolygydd wedi gofyn rhywbeth i chi
mine-asked-means = Atebwch isod; mae'r cofnod yn aros am eich ateb.
mine-confirmed = wedi'i gadarnhau
mine-confirmed-means = Mae adolygydd wedi cytuno beth ydyw, o'r lluniau a'r manylion.
mine-not-confirmable = methu ei gadarnhau
mine-not-confirmable-reason = Doedd adolygydd ddim yn gallu bod yn siŵr beth oedd e. Eu rheswm: “{ $reason }”. Mae'r cofnod yn cael ei gadw, ond nid yw'n cael ei gyfrif gyda'r rhai wedi'u cadarnhau.
mine-not-confirmable-means = Doedd adolygydd ddim yn gallu bod yn siŵr beth oedd e o'r lluniau a'r manylion. Mae'r cofnod yn cael ei gadw, ond nid yw'n cael ei gyfrif gyda'r rhai wedi'u cadarnhau.
mine-merged = wedi'i uno ag adroddiad arall
mine-merged-means = Mae rhywun arall wedi cofnodi'r un anifail. Mae'r adroddiadau'n cael eu cadw gyda'i gilydd a'r anifail yn cael ei gyfrif unwaith.
mine-answer-too-long = Mae'r ateb hwnnw'n rhy hir.
mine-answer-empty = Ysgrifennwch ateb neu ychwanegwch lun.

## Record form: names of the controls and problems (words built in data modules, both bundles)

form-when = Pryd
form-latitude = Lledred
form-longitude = Hydred
form-accuracy = Cywirdeb (metrau)
form-species-short = Rhywogaeth
form-length = Hyd
form-count = Faint
form-life-stage = Cyfnod bywyd
form-condition = Cyflwr
form-how-found = Sut y cafwyd hyd iddo
form-signs-short = Olion pysgota neu bobl
form-notes = Nodiadau
form-photos = Lluniau
form-your-name = Eich enw
problem-too-long = rhy hir: { $max } nod ar y mwyaf
problem-future = mae hyn yn y dyfodol: rhowch yr amser y gwelwyd yr anifail
problem-sign-twice = mae olion wedi'u ticio ddwywaith
problem-key-pick = methu cadw dewis yr allwedd; dewiswch eto neu teipiwch yr enw
problem-egg-case-length = does gan gas wy ddim hyd corff: gadewch hwn yn wag ac ysgrifennwch faint y cas yn y nodiadau
problem-choose-when = dewiswch y dyddiad a'r amser y gwelwyd yr anifail
problem-count = rhif cyfan o 1 i { $max }
problem-choose-condition = dewiswch gyflwr yr anifail
problem-choose-how-found = dewiswch sut y cafwyd hyd iddo
problem-degrees = rhif mewn graddau degol, e.e. 52.4153
problem-latitude = rhwng -90 a 90
problem-longitude = rhwng -180 a 180
problem-accuracy = nifer o fetrau dros 0
problem-a-number = rhif

## Live animal (words built in data modules, both bundles)

live-no-pushing = Peidiwch â'i lusgo na'i wthio yn ôl i'r môr oni bai eich bod wedi'ch hyfforddi: gallwch ei anafu ac anafu'ch hun.

## Record form (words built in data modules, both bundles)

form-measured = wedi'i fesur
form-estimated = wedi'i amcangyfrif

## Position fixes (words built in data modules, both bundles)

fix-age-seconds = ers { $n } eiliad
fix-age-minutes = ers { $n } munud
fix-age-hours = ers { $n } awr
fix-age-days = ers { $n } diwrnod
fix-within = o fewn { $metres } m, { $age }

## Built in data/ (phone)

# Geiriau plaen am ateb a anfonodd y gweinydd heb eiriau ei hun (yn ôl statws HTTP).
api-not-signed-in = dydych chi ddim wedi mewngofnodi, neu mae'r mewngofnodi wedi dod i ben
api-not-allowed = does dim hawl i wneud hyn
api-not-known = dydy'r gweinydd ddim yn gwybod am hyn
api-too-slow = cymerodd y gweinydd ormod o amser i ateb
api-other-version = mae gan y gweinydd fersiwn arall o hyn
api-too-large = mae hyn yn rhy fawr i'r gweinydd
api-wrong-kind-of-file = dydy'r gweinydd ddim yn derbyn y math hwn o ffeil
api-busy = mae'r gweinydd yn brysur
api-unreachable = does dim modd cyrraedd y gweinydd ar hyn o bryd
api-server-problem = cafodd y gweinydd broblem
api-not-accepted = doedd y gweinydd ddim yn gallu derbyn hyn
api-status = { $words } (cod { $status })
api-no-connection = dim cysylltiad â'r gweinydd
api-unreadable = doedd dim modd darllen ateb y gweinydd (tudalen mewngofnodi Wi-Fi?)
api-unsendable = doedd dim modd ysgrifennu'r cais: { $why }
device-unknown-error = gwall anhysbys yn y porwr
device-no-upload-copy = ddaeth dim copi i'w anfon yn ôl
identity-not-given = roddodd y gweinydd ddim hunaniaeth: { $error }
identity-not-kept = doedd dim modd cadw'r hunaniaeth ar y ffôn hwn: { $error }
identity-no-storage = dydy'r porwr hwn ddim yn cadw dim byd (dim localStorage)
identity-storage-refused = gwrthododd y porwr ei chadw (storfa'n llawn neu wedi'i rhwystro)
mine-not-fetched = fy nghofnodion: { $error }
outbox-unreadable = doedd dim modd darllen cofnod a gadwyd: { $error }
replies-unreadable = doedd dim modd darllen ateb a gadwyd: { $error }
replies-photos-missing = dydy lluniau ateb ddim i gyd ar y ffôn hwn eto
walks-unreadable = doedd dim modd darllen taith gerdded a gadwyd: { $error }
sync-photos-unreadable = doedd dim modd darllen y lluniau: { $error }
sync-photos-missing = { $found } o { $taken } llun ar gael ar y ffôn hwn
sync-walk-not-joined = doedd dim modd ychwanegu at y daith: { $error }
# Cymraeg: enw unigol ar ôl rhif ("3 diwrnod").
span-minutes = { $minutes } munud
span-hours = { $hours } awr
span-hours-minutes = { $hours } awr { $minutes } munud
span-days = { $days } diwrnod
key-rank-species = rhywogaeth
key-rank-genus = genws
key-rank-family = teulu
key-rank-order = urdd
key-rank-superorder = uwchurdd
key-set-aside-character = eich ateb am { $character } (dydy'r rhestr ddim yn gofyn hyn bellach)
key-set-aside-state = eich ateb "{ $state }" i "{ $question }" (dydy e ddim yn un o'r atebion bellach)
photo-unreadable = doedd dim modd darllen “{ $name }”: { $error }
photo-not-prepared = doedd dim modd paratoi “{ $name }” i'w anfon: { $detail }
photo-start-unreadable = doedd dim modd darllen ei ddechrau
# Enwau dewislenni'r ffôn yn Saesneg, fel y mae'r ffôn yn eu dangos yn aml.
photo-heic = Mae “{ $name }” yn llun HEIC, a dydy'r porwr hwn ddim yn gallu ei agor. Tynnwch y llun gydag “Ychwanegu llun” yma (mae'n cadw JPEG), neu gosodwch y camera i JPEG (ar iPhone: Settings › Camera › Formats › Most Compatible) a'i ddewis eto.
photo-cannot-open = Doedd y porwr hwn ddim yn gallu agor “{ $name }” fel llun ({ $detail }). Dewiswch lun JPEG neu PNG yn lle hynny.
photo-browser-too-old = Doedd dim modd paratoi “{ $name }” i'w anfon: mae'r porwr hwn yn rhy hen i newid maint lluniau ({ $detail }). Diweddarwch feddalwedd y ffôn (ar iPhone: Settings › General › Software Update) neu agorwch wrackline mewn porwr cyfoes, yna ychwanegwch y llun eto.
photo-time-camera-zone = { $time } (UTC{ $offset }, cylchfa amser y camera ei hun)
photo-time-phone-zone = { $time } (UTC{ $offset }, cylchfa amser y ffôn hwn ar y dyddiad hwnnw)
photo-no-time = dim amser
photo-no-position = dim lleoliad
photo-place = { $lat }, { $lon }
photo-place-within = { $lat }, { $lon } o fewn { $metres } m
photo-says = mae'r llun yn dweud: { $when } · { $place }
form-photo-time = Daw'r amser o lun { $number }: cafodd ei dynnu { $taken }, { $before } cyn amser y ffôn hwn. Cadwch ef os dyna pryd y gwelsoch chi'r anifail.
form-photo-time-and-place = Daw'r amser a'r lle o lun { $number }: cafodd ei dynnu { $taken }, { $before } cyn amser y ffôn hwn. Cadwch nhw os dyna pryd y gwelsoch chi'r anifail.
form-device-says = mae'r ffôn hwn yn dweud: { $time } ({ $offset }) · { $place }

## The guided key's reasons (both bundles: data/key_reasons.rs)

key-reason-not-described = atebwyd "{ $answer }", ond does gan y rhestr ddim am hyn ar gyfer y rhywogaeth hon
key-reason-contradicts = atebwyd "{ $answer }", ond mae gan y rhywogaeth hon { $has }
key-reason-or = neu
key-reason-unknown-area = nid yw'r cod ardal { $code } yn y rhestr hon, felly ni ddefnyddiwyd yr ardal
key-reason-known-from = yn hysbys o { $area }
key-reason-not-known-from = nid yw'n hysbys o { $area } yn y rhestr hon
key-reason-nearby =
    { $count ->
        [0] dim cofnodion wedi'u cadarnhau gerllaw
        [one] 1 cofnod wedi'i gadarnhau gerllaw
       *[other] { $count } cofnod wedi'u cadarnhau gerllaw
    }
key-reason-size-not-comparable = ni ellir cymharu { $measured } ag uchafswm { $maximum } y rhywogaeth hon, felly ni ddefnyddiwyd maint
key-reason-within = mae { $size } o fewn uchafswm hysbys y rhywogaeth hon, sef { $max } cm
key-reason-over = mae { $size } dros uchafswm hysbys y rhywogaeth hon, sef { $max } cm
key-reason-newborn = mae { $size } yn llai nag un newydd-anedig o'r rhywogaeth hon, sy'n tyfu i { $max } cm
key-size =
    { $cm } cm { $how ->
        [estimated] (amcangyfrif)
       *[measured] (wedi'i fesur)
    }
key-size-by-equation =
    { $kind } { $cm } cm { $how ->
        [estimated] (amcangyfrif)
       *[measured] (wedi'i fesur)
    } (tua { $total } cm o hyd cyfan drwy { $equation }; { $source })
key-size-by-generic-ratio =
    { $kind } { $cm } cm { $how ->
        [estimated] (amcangyfrif)
       *[measured] (wedi'i fesur)
    } (tua { $total } cm o hyd cyfan drwy'r gymhareb gyffredinol { $equation }, arfer cyffredin: does gan y rhestr ddim hafaliad cyhoeddedig ar gyfer y rhywogaeth hon)
