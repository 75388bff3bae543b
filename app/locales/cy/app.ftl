# Geiriau wrackline yn Gymraeg (Welsh).
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected by a
# native Welsh speaker (ideally one who knows the shore and stranding work) before use.
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

## The phone's page

phone-safety-link = Diogelwch
phone-figures-link = Ffigurau
phone-review-link = Adolygu
phone-install = Gosod
phone-online = ar-lein
phone-offline = all-lein: mae'r cofnodion yn aros ar y ffôn hwn
phone-storage-broken = Dydy'r storfa all-lein ddim yn gweithio: { $problem }. Does dim modd cadw cofnodion ar y ffôn hwn.
phone-safety-heading = Diogelwch ar y traeth
phone-back = ← Yn ôl i gofnodi
phone-question-one = Mae adolygydd wedi gofyn rhywbeth i chi am gofnod: atebwch o dan Fy nghofnodion.
phone-question-many = Mae adolygwyr wedi gofyn i chi am rai cofnodion: atebwch o dan Fy nghofnodion.
phone-safety-reminders = Atgoffa am ddiogelwch: pigau, brathiadau, llanw
phone-first-record = Cyn eich cofnod cyntaf
phone-safety-read = Rwyf wedi darllen hwn
