# A runnable image of the Serimetry service (`serimetry serve`).
FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
COPY . .
RUN dotnet publish cli/Serimetry.Cli.csproj -c Release -o /app --nologo

FROM mcr.microsoft.com/dotnet/aspnet:10.0
WORKDIR /app
COPY --from=build /app .
VOLUME ["/data"]
USER app
ENTRYPOINT ["dotnet", "serimetry.dll"]
EXPOSE 8080
# DICOM receiver (C-ECHO, C-STORE) when started with --dicom-port 11112 --dicom-address 0.0.0.0
EXPOSE 11112
# Create a key first: docker run --rm -v DATA:/data IMAGE keys create --name pacs --data /data
CMD ["serve", "--urls", "http://0.0.0.0:8080", "--data", "/data"]
