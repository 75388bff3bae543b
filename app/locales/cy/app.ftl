# Geiriau wrackline yn Gymraeg (Welsh).
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected by a
# fluent Welsh speaker who knows the shore and stranding work before use.
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
